#!/usr/bin/python3
"""A local SMTP server for plateau's e-mail tests (Debian's python3-aiosmtpd).

Listens on 127.0.0.1, prints its port on the first line of stdout, and writes every message it
accepts to OUT/NNN.eml (envelope sender and recipients first, then the message). Options make it
refuse recipients, offer STARTTLS with a given certificate, and require AUTH.

usage: smtp_sink.py OUT [--refuse] [--tls CERT KEY] [--auth USER PASSWORD]
"""
import argparse
import os
import signal
import socket
import ssl
import sys
import threading

from aiosmtpd.controller import Controller
from aiosmtpd.smtp import AuthResult, LoginPassword


class Sink:
    def __init__(self, out, refuse):
        self.out = out
        self.refuse = refuse
        self.count = 0

    async def handle_RCPT(self, server, session, envelope, address, rcpt_options):
        if self.refuse:
            return "550 5.1.1 no such user here"
        envelope.rcpt_tos.append(address)
        return "250 OK"

    async def handle_DATA(self, server, session, envelope):
        self.count += 1
        path = os.path.join(self.out, "%03d.eml" % self.count)
        with open(path + ".part", "wb") as f:
            f.write(("X-Envelope-From: %s\n" % envelope.mail_from).encode())
            f.write(("X-Envelope-To: %s\n" % ", ".join(envelope.rcpt_tos)).encode())
            f.write(envelope.original_content or envelope.content)
        os.rename(path + ".part", path)  # complete files only, for the test to read
        return "250 2.0.0 accepted"


def free_port():
    with socket.socket() as s:
        s.bind(("127.0.0.1", 0))
        return s.getsockname()[1]


def main():
    parser = argparse.ArgumentParser()
    parser.add_argument("out")
    parser.add_argument("--refuse", action="store_true")
    parser.add_argument("--tls", nargs=2, metavar=("CERT", "KEY"))
    parser.add_argument("--auth", nargs=2, metavar=("USER", "PASSWORD"))
    args = parser.parse_args()
    options = {}
    if args.tls:
        context = ssl.create_default_context(ssl.Purpose.CLIENT_AUTH)
        context.load_cert_chain(args.tls[0], args.tls[1])
        options["tls_context"] = context
        options["require_starttls"] = True
    if args.auth:
        user, password = args.auth[0].encode(), args.auth[1].encode()

        def authenticator(server, session, envelope, mechanism, auth_data):
            ok = isinstance(auth_data, LoginPassword) and auth_data.login == user and \
                auth_data.password == password
            return AuthResult(success=ok)

        options["authenticator"] = authenticator
        options["auth_required"] = True
        options["auth_require_tls"] = bool(args.tls)
    port = free_port()
    controller = Controller(Sink(args.out, args.refuse), hostname="127.0.0.1", port=port,
                            **options)
    controller.start()
    print(port, flush=True)
    stop = threading.Event()
    signal.signal(signal.SIGTERM, lambda *a: stop.set())
    stop.wait()
    controller.stop()


if __name__ == "__main__":
    sys.exit(main())

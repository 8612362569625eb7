// Reads a probe file from a byte offset to its current end in fixed-size chunks and feeds the bytes
// to a RowParser. I/O only: every number stays in core. Stateless; one call per read.
#ifndef PLATEAU_DAEMON_INGEST_PROBE_FILE_READER_H_
#define PLATEAU_DAEMON_INGEST_PROBE_FILE_READER_H_

#include <cstdint>
#include <functional>
#include <string>

#include "core/result.h"
#include "core/row_parser.h"

namespace plateau {

// Reads `path` from `offset` (bytes) to its end; returns the bytes read in this call, or an error
// such as "cannot open runs/a.dat: No such file or directory" (the rows fed before a read error
// stay fed). `keep_going` is asked after every chunk; reading stops early when it returns false
// (a caller that met a fatal layout error).
Result<std::uint64_t> ReadProbeFile(const std::string& path, std::uint64_t offset, RowParser& parser,
                             RowSink& sink, const std::function<bool()>& keep_going = {});

}  // namespace plateau

#endif  // PLATEAU_DAEMON_INGEST_PROBE_FILE_READER_H_

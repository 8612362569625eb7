// libFuzzer target for core/RowParser, the first code every byte of a probe file meets. Beyond
// "no crash, no leak, no undefined behaviour" it checks the parser's contracts on every input:
// feeding the bytes in one piece, in chunks, or one by one gives the same rows and bad lines;
// every row has one finite value per column; consumed plus pending bytes account for the input;
// a parser resumed at the consumed offset (a daemon restart) continues exactly as the
// uninterrupted one; and a probe-description header gives the same probes, one per probe field,
// with distinct column names, however the bytes arrive. A broken contract aborts, which libFuzzer reports as a crash.
#include <algorithm>
#include <cmath>
#include <cstring>
#include <cstdint>
#include <string>
#include <string_view>
#include <vector>

#include "core/row_parser.h"
#include "tests/fuzz/fuzz_checks.h"

namespace {

[[noreturn]] void Fail(const char* what) { plateau::fuzz::ContractBroken("row parser", what); }

struct Recorded {
  std::vector<std::string> columns;
  std::vector<std::uint64_t> row_lines;
  std::vector<double> values;
  std::vector<std::uint64_t> bad_lines;
  std::vector<int> probe_ids;
  std::vector<double> probe_positions;  // compared bit for bit: NaN marks a probe without one
};

class RecordingSink : public plateau::RowSink {
 public:
  explicit RecordingSink(Recorded* out) : out_(out) {}
  void OnColumns(const std::vector<std::string>& names) override { out_->columns = names; }
  void OnRow(std::uint64_t line, const double* values) override {
    out_->row_lines.push_back(line);
    for (std::size_t i = 0; i < out_->columns.size(); ++i) {
      if (!std::isfinite(values[i])) Fail("a row carries a value that is not finite");
      out_->values.push_back(values[i]);
    }
  }
  void OnBadLine(std::uint64_t line, std::string_view reason) override {
    if (reason.empty()) Fail("a bad line without a reason");
    out_->bad_lines.push_back(line);
  }

 private:
  Recorded* out_;
};

bool Same(const Recorded& a, const Recorded& b) {
  // Values compared bit for bit through ==: every value is finite, so == is exact here.
  const auto same_bits = [](const std::vector<double>& x, const std::vector<double>& y) {
    return x.size() == y.size() &&
           (x.empty() || std::memcmp(x.data(), y.data(), x.size() * sizeof(double)) == 0);
  };
  return a.columns == b.columns && a.row_lines == b.row_lines && a.values == b.values &&
         a.bad_lines == b.bad_lines && a.probe_ids == b.probe_ids &&
         same_bits(a.probe_positions, b.probe_positions);
}

Recorded FeedInChunks(std::string_view bytes, std::size_t chunk, plateau::RowParser& parser) {
  Recorded out;
  RecordingSink sink(&out);
  for (std::size_t at = 0; at < bytes.size(); at += chunk)
    parser.Feed(bytes.substr(at, chunk), sink);
  if (parser.consumed_bytes() + parser.pending_bytes() != bytes.size()) {
    Fail("consumed and pending bytes do not add up to the input");
  }
  for (const plateau::ProbeLocation& p : parser.probes()) {
    out.probe_ids.push_back(p.id);
    out.probe_positions.insert(out.probe_positions.end(), p.position.begin(), p.position.end());
  }
  if (!parser.probes().empty()) {
    // Probe columns: the time and at least one per probe, every name distinct.
    if (out.columns.size() < parser.probes().size() + 1) Fail("fewer probe columns than probes");
    std::vector<std::string> names = out.columns;
    std::sort(names.begin(), names.end());
    if (std::adjacent_find(names.begin(), names.end()) != names.end()) {
      Fail("a probe header gave two columns of the same name");
    }
  }
  return out;
}

}  // namespace

namespace plateau::fuzz {

int RowParserOneInput(const std::uint8_t* data, std::size_t size) {
  if (size == 0) return 0;
  const std::size_t chunk = 1 + data[0] % 17;
  const std::string_view bytes(reinterpret_cast<const char*>(data) + 1, size - 1);

  // Probe columns are named after the file: the same for every way of feeding.
  const auto named_parser = [] {
    plateau::RowParser parser;
    parser.set_field_name("U");
    return parser;
  };
  plateau::RowParser whole_parser = named_parser();
  const Recorded whole = FeedInChunks(bytes, bytes.size() + 1, whole_parser);
  plateau::RowParser chunked_parser = named_parser();
  if (!Same(whole, FeedInChunks(bytes, chunk, chunked_parser))) {
    Fail("chunked feeding differs from feeding the whole");
  }
  plateau::RowParser byte_parser = named_parser();
  if (!Same(whole, FeedInChunks(bytes, 1, byte_parser))) {
    Fail("byte-by-byte feeding differs from feeding the whole");
  }

  // A restart: the first parser stops somewhere, a new one resumes at its consumed offset.
  plateau::RowParser first = named_parser();
  const std::size_t stop = (bytes.size() * data[0]) / 255;
  const Recorded before = FeedInChunks(bytes.substr(0, stop), stop + 1, first);
  if (!first.has_columns()) return 0;  // the daemon re-reads from the start in that case
  plateau::RowParser resumed;
  resumed.Resume(first.column_names(), first.lines(), first.consumed_bytes(), first.rows(),
                 first.bad_lines());
  Recorded after;
  after.columns = first.column_names();
  RecordingSink sink(&after);
  resumed.Feed(bytes.substr(first.consumed_bytes()), sink);
  Recorded joined = before;
  joined.probe_ids = whole.probe_ids;  // a resumed parser has no header lines to read them from
  joined.probe_positions = whole.probe_positions;
  joined.row_lines.insert(joined.row_lines.end(), after.row_lines.begin(), after.row_lines.end());
  joined.values.insert(joined.values.end(), after.values.begin(), after.values.end());
  joined.bad_lines.insert(joined.bad_lines.end(), after.bad_lines.begin(), after.bad_lines.end());
  if (!Same(whole, joined)) Fail("a resumed parser differs from an uninterrupted one");
  if (resumed.rows() != whole_parser.rows() || resumed.bad_lines() != whole_parser.bad_lines()) {
    Fail("a resumed parser's counters differ from an uninterrupted one's");
  }
  return 0;
}

}  // namespace plateau::fuzz

#ifdef PLATEAU_LIBFUZZER
extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  return plateau::fuzz::RowParserOneInput(data, size);
}
#endif

// libFuzzer target for core/RowParser, the first code every byte of a probe file meets. Beyond
// "no crash, no leak, no undefined behaviour" it checks the parser's contracts on every input:
// feeding the bytes in one piece, in chunks, or one by one gives the same rows and bad lines;
// every row has one finite value per column; consumed plus pending bytes account for the input;
// and a parser resumed at the consumed offset (a daemon restart) continues exactly as the
// uninterrupted one. A broken contract aborts, which libFuzzer reports as a crash.
#include <cmath>
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
  return a.columns == b.columns && a.row_lines == b.row_lines && a.values == b.values &&
         a.bad_lines == b.bad_lines;
}

Recorded FeedInChunks(std::string_view bytes, std::size_t chunk, plateau::RowParser& parser) {
  Recorded out;
  RecordingSink sink(&out);
  for (std::size_t at = 0; at < bytes.size(); at += chunk)
    parser.Feed(bytes.substr(at, chunk), sink);
  if (parser.consumed_bytes() + parser.pending_bytes() != bytes.size()) {
    Fail("consumed and pending bytes do not add up to the input");
  }
  return out;
}

}  // namespace

namespace plateau::fuzz {

int RowParserOneInput(const std::uint8_t* data, std::size_t size) {
  if (size == 0) return 0;
  const std::size_t chunk = 1 + data[0] % 17;
  const std::string_view bytes(reinterpret_cast<const char*>(data) + 1, size - 1);

  plateau::RowParser whole_parser;
  const Recorded whole = FeedInChunks(bytes, bytes.size() + 1, whole_parser);
  plateau::RowParser chunked_parser;
  if (!Same(whole, FeedInChunks(bytes, chunk, chunked_parser))) {
    Fail("chunked feeding differs from feeding the whole");
  }
  plateau::RowParser byte_parser;
  if (!Same(whole, FeedInChunks(bytes, 1, byte_parser))) {
    Fail("byte-by-byte feeding differs from feeding the whole");
  }

  // A restart: the first parser stops somewhere, a new one resumes at its consumed offset.
  plateau::RowParser first;
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

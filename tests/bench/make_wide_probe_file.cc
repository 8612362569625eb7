// Writes a wide probe file for the ingest benchmark: a time column and COLUMNS signal columns of
// AR(1) noise in %.6e (13 bytes a value), ROWS rows. 200000 rows x 101 columns is about 270 MB.
// usage: make_wide_probe_file PATH ROWS COLUMNS
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <random>
#include <vector>

int main(int argc, char** argv) {
  if (argc != 4) {
    std::fprintf(stderr, "usage: make_wide_probe_file PATH ROWS COLUMNS\n");
    return 2;
  }
  const long rows = std::atol(argv[2]);
  const int columns = std::atoi(argv[3]);
  std::FILE* f = std::fopen(argv[1], "w");
  if (f == nullptr) {
    std::perror(argv[1]);
    return 1;
  }
  std::fprintf(f, "# benchmark probe file (synthetic)\n# time");
  for (int c = 0; c < columns; ++c) std::fprintf(f, " p%d", c);
  std::fprintf(f, "\n");
  std::mt19937_64 rng(42);
  std::normal_distribution<double> normal;
  std::vector<double> state(columns, 0.0);
  for (long r = 0; r < rows; ++r) {
    std::fprintf(f, "%.6e", r * 1e-3);
    for (int c = 0; c < columns; ++c) {
      state[c] = 0.9 * state[c] + normal(rng);
      std::fprintf(f, " %.6e", 1.0 + 0.1 * state[c]);
    }
    std::fputc('\n', f);
  }
  return std::fclose(f) == 0 ? 0 : 1;
}

// MSER warm-up truncation (White 1997, "An effective truncation heuristic for bias reduction in
// simulation output", Simulation 69(6) 323-334). Pure numerics; stateless.
#ifndef PLATEAU_CORE_MSER_TRUNCATION_H_
#define PLATEAU_CORE_MSER_TRUNCATION_H_

#include <vector>

namespace plateau {

// Number d of leading values to delete, minimising MSER(d) = sum_{i >= d} (x_i - mean_d)^2 / (n - d)^2
// over 0 <= d <= max_fraction * n (White's rule: a minimum in the second half means the run is too
// short, so the search stops at half). Ties go to the smaller d. Returns 0 for fewer than 4 values.
int MserTruncation(const std::vector<double>& series, double max_fraction = 0.5);

}  // namespace plateau

#endif  // PLATEAU_CORE_MSER_TRUNCATION_H_

// Writes lots for networkx_check.py: for each case, every pair within tolerance found by trying
// all pairs (not our grid search) with its error, and our pairing's count and total. The
// script solves each case again with networkx's exact max_weight_matching and compares.
#include <cstdio>
#include <random>
#include <string>

#include "photolot/pairing.h"

int main() {
  std::mt19937_64 rng(4242);
  int case_no = 0;
  for (int n : {150, 300, 500}) {
    for (photolot::TrackingMode mode :
         {photolot::TrackingMode::absolute, photolot::TrackingMode::trimmable}) {
      for (int cap : {16, 2, 1}) {
        // Denser lots for the larger cases: more pairs within tolerance, more blossoms.
        const double spread = n == 150 ? 0.12 : 0.07;
        std::normal_distribution<double> ln_r10(std::log(20e3), spread), gamma(0.75, spread / 6);
        photolot::LotFit fit;
        for (int i = 0; i < n; ++i) {
          photolot::UnitFit u;
          u.id = "R" + std::to_string(i);
          u.status = photolot::FitStatus::fitted;
          u.curve = photolot::make_power_law(std::exp(ln_r10(rng)), gamma(rng));
          fit.units.push_back(std::move(u));
        }
        photolot::PairOptions o;
        o.mode = mode;
        o.tolerance_pct = mode == photolot::TrackingMode::absolute ? 3.0 : 0.5;
        o.candidate_cap_per_unit = cap;
        const photolot::Pairing p = photolot::pair_units(fit, o);
        std::printf("case %d n=%d mode=%s cap=%d\n", ++case_no, n,
                    std::string(to_string(mode)).c_str(), cap);
        std::printf("ours %zu %.12g %.12g %s %zu %zu\n", p.pairs.size(), p.total_error_pct,
                    p.total_error_rounding_bound_pct,
                    p.proof == photolot::ProofStatus::proved_optimal ? "proved" : "not-proved",
                    p.counts.warm_rounds, p.counts.warm_fallbacks);
        for (int i = 0; i < n; ++i)
          for (int j = i + 1; j < n; ++j) {
            const double e =
                photolot::tracking_error(fit.units[i].curve, fit.units[j].curve, o).error_pct;
            if (e <= o.tolerance_pct) std::printf("e %d %d %.15g\n", i, j, e);
          }
        std::printf("end\n");
      }
    }
  }
  return 0;
}

#include "session.h"

#include <QMetaObject>
#include <cmath>

namespace photolot::workbench {
namespace {

bool same_units(const Lot& lot, const LotFit& fit) {
  if (lot.units.size() != fit.units.size()) return false;
  for (std::size_t i = 0; i < lot.units.size(); ++i) {
    if (lot.units[i].id != fit.units[i].id) return false;
  }
  return true;
}

LotAnalysis analyse(const LotFit& fit, const std::optional<Spec>& spec) {
  LotAnalysis a;
  StatisticsOptions options;
  if (spec) {
    options.coverage = spec->tolerance_coverage;
    options.confidence = spec->tolerance_confidence;
  }
  a.statistics = lot_statistics(fit, options, spec ? &*spec : nullptr);
  if (spec) {
    a.verdicts = judge(fit, *spec);
    a.acceptance = decide(*spec, *a.verdicts);
  }
  return a;
}

// Equal, NaN equal to NaN (no coefficient given).
bool same_coefficient(double a, double b) { return (std::isnan(a) && std::isnan(b)) || a == b; }

double spec_coefficient(const std::optional<Spec>& spec) {
  return spec && std::isfinite(spec->temp_coeff_pct_per_c) ? spec->temp_coeff_pct_per_c : kNaN;
}

}  // namespace

fitting::ExtendedFitOptions AnalysisSession::effectiveModelOptions() const {
  fitting::ExtendedFitOptions o = model_options_;
  if (const double tc = spec_coefficient(spec_); std::isfinite(tc)) o.spec_tc10_pct_per_c = tc;
  return o;
}

void AnalysisSession::setModelOptions(const fitting::ExtendedFitOptions& options) {
  model_options_ = options;
  saved_fit_.reset();
  fit_stale_ = analysis_stale_ = pairing_stale_ = import_result_ != nullptr || import_stale_;
  emit inputsChanged();
}

AnalysisSession::AnalysisSession(QObject* parent) : QObject(parent) {
  poll_timer_.setInterval(50);
  connect(&poll_timer_, &QTimer::timeout, this, &AnalysisSession::pollProgress);
}

AnalysisSession::~AnalysisSession() { stopWorker(); }

void AnalysisSession::setSources(std::vector<SourceFile> sources) {
  sources_ = std::move(sources);
  saved_fit_.reset();
  import_stale_ = fit_stale_ = analysis_stale_ = pairing_stale_ = !sources_.empty();
  if (sources_.empty()) {
    import_result_.reset();
    lot_fit_.reset();
    curve_series_.reset();
    analysis_.reset();
    pairing_.reset();
  }
  emit inputsChanged();
}

void AnalysisSession::setImportOptions(const ImportOptions& options) {
  import_options_ = options;
  import_stale_ = fit_stale_ = analysis_stale_ = pairing_stale_ = !sources_.empty();
  emit inputsChanged();
}

void AnalysisSession::setFitOptions(const fitting::FitOptions& options) {
  fit_options_ = options;
  saved_fit_.reset();
  fit_stale_ = analysis_stale_ = pairing_stale_ = import_result_ != nullptr || import_stale_;
  emit inputsChanged();
}

void AnalysisSession::setSpec(std::optional<Spec> spec) {
  // A spec's temperature coefficient enters the fit where the readings identify none.
  const bool coefficient_changed =
      model_options_.temperature != fitting::TemperatureMode::off &&
      !same_coefficient(spec_coefficient(spec_), spec_coefficient(spec));
  spec_ = std::move(spec);
  if (coefficient_changed && (import_result_ != nullptr || import_stale_)) {
    saved_fit_.reset();
    fit_stale_ = true;
  }
  analysis_stale_ = lot_fit_ != nullptr || fit_stale_;
  // Pairing takes the units that conform to the spec: it follows the spec too.
  pairing_stale_ = pairing_wanted_;
  emit inputsChanged();
}

void AnalysisSession::setPairOptions(const PairOptions& options) {
  pair_options_ = options;
  pairing_stale_ = pairing_wanted_;
  emit inputsChanged();
}

void AnalysisSession::setPairAllFitted(bool all) {
  if (all == pair_all_fitted_) return;
  pair_all_fitted_ = all;
  pairing_stale_ = pairing_wanted_;
  emit inputsChanged();
}

void AnalysisSession::setPairingWanted(bool wanted) {
  pairing_wanted_ = wanted;
  pairing_stale_ = wanted;
  if (!wanted) pairing_.reset();
}

void AnalysisSession::offerSavedFit(std::shared_ptr<const LotFit> fit) {
  saved_fit_ = std::move(fit);
}

void AnalysisSession::clear() {
  stopWorker();
  setStep(Step::idle);
  sources_.clear();
  saved_fit_.reset();
  spec_.reset();
  import_result_.reset();
  lot_fit_.reset();
  curve_series_.reset();
  analysis_.reset();
  pairing_.reset();
  pairing_wanted_ = false;
  import_stale_ = fit_stale_ = analysis_stale_ = pairing_stale_ = false;
  emit inputsChanged();
  emit importFinished();
  emit fitFinished();
  emit analysisFinished();
  emit pairingFinished();
}

void AnalysisSession::run() {
  stopWorker();
  const bool pairing_due = pairing_wanted_ && pairing_stale_;
  if (!import_stale_ && !fit_stale_ && !analysis_stale_ && !pairing_due) {
    setStep(Step::idle);
    return;
  }
  if (sources_.empty()) return;
  startWorker();
}

void AnalysisSession::cancel() {
  if (!busy()) return;
  stopWorker();
  setStep(Step::idle);
  emit cancelled();
}

void AnalysisSession::stopWorker() {
  ++generation_;  // results still queued from the old worker are dropped on arrival
  if (worker_.joinable()) {
    worker_.request_stop();
    worker_.join();
  }
  poll_timer_.stop();
}

void AnalysisSession::setStep(Step step) {
  const bool was_busy = busy();
  step_ = step;
  if (was_busy != busy()) emit busyChanged(busy());
}

void AnalysisSession::pollProgress() {
  if (!shared_) return;
  const auto step = static_cast<Step>(shared_->step.load());
  if (step != Step::idle && step != step_) setStep(step);
  emit progress(step_, static_cast<qint64>(shared_->done.load()),
                static_cast<qint64>(shared_->total.load()));
}

void AnalysisSession::startWorker() {
  const unsigned generation = ++generation_;
  shared_ = std::make_shared<Shared>();
  auto shared = shared_;

  // The worker owns copies of its inputs, so the GUI may change them while it runs.
  struct Job {
    bool import, fit, analysis, pairing;
    std::vector<SourceFile> sources;
    ImportOptions import_options;
    fitting::FitOptions fit_options;
    fitting::ExtendedFitOptions model_options;
    std::optional<Spec> spec;
    PairOptions pair_options;
    std::shared_ptr<const ImportResult> imported;
    std::shared_ptr<const LotFit> fit_result;
    std::shared_ptr<const LotFit> saved_fit;
    std::shared_ptr<const LotAnalysis> analysis_result;
    bool pair_all_fitted;
  };
  Job job{import_stale_,
          fit_stale_ || import_stale_,
          analysis_stale_ || fit_stale_ || import_stale_,
          pairing_wanted_ && (pairing_stale_ || fit_stale_ || import_stale_),
          import_stale_ ? sources_ : std::vector<SourceFile>{},
          import_options_,
          fit_options_,
          effectiveModelOptions(),
          spec_,
          pair_options_,
          import_result_,
          lot_fit_,
          saved_fit_,
          analysis_stale_ || fit_stale_ || import_stale_ ? nullptr : analysis_,
          pair_all_fitted_};
  const Step first = job.import     ? Step::import
                     : job.fit      ? Step::fit
                     : job.analysis ? Step::analysis
                                    : Step::pairing;
  shared->step = static_cast<int>(first);
  setStep(first);

  // Each result is posted to the GUI thread as soon as its step ends; a result from an older
  // run (generation) is dropped there.
  auto post = [this, generation](auto apply) {
    QMetaObject::invokeMethod(
        this,
        [this, generation, apply = std::move(apply)]() mutable {
          if (generation == generation_) apply();
        },
        Qt::QueuedConnection);
  };

  worker_ = std::jthread([this, shared, post, job = std::move(job)](std::stop_token stop) mutable {
    auto progress = [shared](std::size_t done, std::size_t total) {
      shared->done = done;
      shared->total = total;
    };
    auto begin = [shared](Step step, std::size_t total) {
      shared->step = static_cast<int>(step);
      shared->done = 0;
      shared->total = total;
    };
    [&] {
      if (job.import) {
        begin(Step::import, job.sources.size());
        // Logs opened from the window arrive unhashed: hash them here, off the GUI thread.
        std::vector<std::string> hashes;
        for (const auto& s : job.sources) {
          hashes.push_back(s.sha256_hex.empty() ? sha256_hex(s.content) : s.sha256_hex);
        }
        auto result =
            std::make_shared<const ImportResult>(run_import(job.sources, job.import_options));
        if (stop.stop_requested()) return;
        job.imported = result;
        post([this, result, hashes = std::move(hashes)] {
          if (hashes.size() == sources_.size()) {
            for (std::size_t i = 0; i < hashes.size(); ++i) sources_[i].sha256_hex = hashes[i];
          }
          import_result_ = result;
          lot_fit_.reset();
          curve_series_.reset();
          analysis_.reset();
          pairing_.reset();
          import_stale_ = false;
          ++import_runs_;
          emit importFinished();
        });
      }
      if (!job.imported) return;
      if (job.fit) {
        begin(Step::fit, job.imported->lot.units.size());
        std::shared_ptr<const LotFit> fit;
        bool fitted = false;
        if (job.saved_fit && same_units(job.imported->lot, *job.saved_fit)) {
          fit = job.saved_fit;
        } else {
          fit = std::make_shared<const LotFit>(
              run_fit(job.imported->lot, job.fit_options, job.model_options, progress, stop));
          fitted = true;
        }
        if (stop.stop_requested()) return;
        job.fit_result = fit;
        // The curves of every unit, here rather than on the GUI thread when units are selected.
        auto series = std::make_shared<const std::vector<UnitSeries>>(
            build_all_curve_series(job.imported->lot, fit.get()));
        if (stop.stop_requested()) return;
        post([this, fit, fitted, series] {
          lot_fit_ = fit;
          curve_series_ = series;
          analysis_.reset();  // until the analysis of this fit arrives
          pairing_.reset();
          saved_fit_.reset();
          fit_stale_ = false;
          if (fitted) ++fit_runs_;
          emit fitFinished();
        });
      }
      if (!job.fit_result) return;
      if (job.analysis) {
        begin(Step::analysis, 0);
        auto analysis = std::make_shared<const LotAnalysis>(analyse(*job.fit_result, job.spec));
        if (stop.stop_requested()) return;
        job.analysis_result = analysis;
        post([this, analysis] {
          analysis_ = analysis;
          analysis_stale_ = false;
          ++analysis_runs_;
          emit analysisFinished();
        });
      }
      if (job.pairing) {
        begin(Step::pairing, job.fit_result->units.size());
        // As photolot-cli: with a spec, the units that conform to it take part; else (or when
        // asked) every fitted unit.
        const std::vector<UnitVerdict>* verdicts =
            job.analysis_result && job.analysis_result->verdicts ? &*job.analysis_result->verdicts
                                                                 : nullptr;
        const bool conforming_only = !job.pair_all_fitted && job.spec && verdicts &&
                                     verdicts->size() == job.fit_result->units.size();
        std::vector<std::size_t> eligible;
        for (std::size_t i = 0; i < job.fit_result->units.size(); ++i) {
          const bool ok = conforming_only ? (*verdicts)[i].verdict == Verdict::conforming
                                          : job.fit_result->units[i].ok();
          if (ok) eligible.push_back(i);
        }
        auto pairing = std::make_shared<const Pairing>(
            pair_units(*job.fit_result, eligible, job.pair_options, progress, stop));
        if (stop.stop_requested() || pairing->cancelled) return;
        const auto among = conforming_only ? PairEligibility::conforming : PairEligibility::fitted;
        post([this, pairing, among] {
          pairing_ = pairing;
          pairing_eligibility_ = among;
          pairing_stale_ = false;
          ++pairing_runs_;
          emit pairingFinished();
        });
      }
    }();
    post([this] { onWorkerEnded(generation_); });
  });
  poll_timer_.start();
}

void AnalysisSession::onWorkerEnded(unsigned) {
  poll_timer_.stop();
  if (worker_.joinable()) worker_.join();
  pollProgress();
  setStep(Step::idle);
}

}  // namespace photolot::workbench

// The analysis session: the inputs of a lot (source files, import choices, fit options, spec,
// pairing options) and the result of each step (import, fit, statistics and acceptance,
// pairing). Steps run on a worker thread; the session reruns only the steps whose inputs
// changed since their last run and announces each result with a signal. Results are shared
// immutable snapshots, so views can hold them while a new run is going.
#pragma once

#include <QObject>
#include <QTimer>
#include <atomic>
#include <memory>
#include <optional>
#include <thread>
#include <vector>

#include "curve_series.h"
#include "engine.h"
#include "fit_handling.h"
#include "photolot/acceptance.h"
#include "photolot/pairing.h"
#include "photolot/spec.h"
#include "photolot/statistics.h"

namespace photolot::workbench {

// What the statistics and acceptance step produce; verdicts and acceptance need a spec.
struct LotAnalysis {
  LotStatistics statistics;
  std::optional<std::vector<UnitVerdict>> verdicts;
  std::optional<Acceptance> acceptance;
};

// Which units a pairing run took: those conforming to the spec (the default when a spec is
// loaded, as photolot-cli does) or every fitted unit.
enum class PairEligibility { fitted, conforming };

class AnalysisSession : public QObject {
  Q_OBJECT
 public:
  enum class Step { idle, import, fit, analysis, pairing };

  explicit AnalysisSession(QObject* parent = nullptr);
  ~AnalysisSession() override;

  // Inputs. Each setter marks the steps downstream of it as stale; run() brings them up to date.
  void setSources(std::vector<SourceFile> sources);
  void setImportOptions(const ImportOptions& options);
  void setFitOptions(const fitting::FitOptions& options);
  // The curve model, over-range bounds, bench profile and temperature handling (models.h).
  // Defaults as photolot-cli analyze: the power law, temperature fitted where identifiable.
  // The spec's temperature coefficient, when it gives one, is applied where the readings do
  // not identify a coefficient (spec_tc10_pct_per_c here is overridden by it).
  void setModelOptions(const fitting::ExtendedFitOptions& options);
  void setSpec(std::optional<Spec> spec);
  void setPairOptions(const PairOptions& options);
  // Pair every fitted unit even when a spec is loaded (off: only the conforming ones).
  void setPairAllFitted(bool all);
  bool pairAllFitted() const { return pair_all_fitted_; }
  // Pairing runs only once asked for (it can take a while on a big lot); then it follows the fit.
  void setPairingWanted(bool wanted);
  // A fit saved earlier (a workspace's results): used instead of fitting again when the next
  // import gives the same units, in the same order.
  void offerSavedFit(std::shared_ptr<const LotFit> fit);

  const std::vector<SourceFile>& sources() const { return sources_; }
  const ImportOptions& importOptions() const { return import_options_; }
  const fitting::FitOptions& fitOptions() const { return fit_options_; }
  const fitting::ExtendedFitOptions& modelOptions() const { return model_options_; }
  // The model options the fit runs with: modelOptions() plus the spec's coefficient.
  fitting::ExtendedFitOptions effectiveModelOptions() const;
  const std::optional<Spec>& spec() const { return spec_; }
  const PairOptions& pairOptions() const { return pair_options_; }
  bool pairingWanted() const { return pairing_wanted_; }

  // Starts the stale steps in the background. A run already going is stopped first.
  void run();
  // Asks the running step to stop; its partial result is dropped and the step stays stale.
  void cancel();
  bool busy() const { return step_ != Step::idle; }
  Step step() const { return step_; }
  bool importStale() const { return import_stale_; }
  bool fitStale() const { return fit_stale_; }

  // Results, null until the step has run on the current inputs.
  std::shared_ptr<const ImportResult> importResult() const { return import_result_; }
  std::shared_ptr<const LotFit> lotFit() const { return lot_fit_; }
  // What the curves view plots for every unit (lot order), built on the worker with the fit;
  // null until then.
  std::shared_ptr<const std::vector<UnitSeries>> curveSeries() const { return curve_series_; }
  std::shared_ptr<const LotAnalysis> analysis() const { return analysis_; }
  std::shared_ptr<const Pairing> pairing() const { return pairing_; }
  // The units the shown pairing took part from.
  PairEligibility pairingEligibility() const { return pairing_eligibility_; }
  const Lot* lot() const { return import_result_ ? &import_result_->lot : nullptr; }

  // How many times each step has run to completion (tests read them; a saved fit taken over
  // does not count as a fit run).
  int importRuns() const { return import_runs_; }
  int fitRuns() const { return fit_runs_; }
  int analysisRuns() const { return analysis_runs_; }
  int pairingRuns() const { return pairing_runs_; }

  // Drops inputs and results (File > Close lot).
  void clear();

 signals:
  void busyChanged(bool busy);
  // done/total of the running step; polled from the worker every 50 ms, never flooded.
  void progress(photolot::workbench::AnalysisSession::Step step, qint64 done, qint64 total);
  void importFinished();
  void fitFinished();
  void analysisFinished();
  void pairingFinished();
  void cancelled();
  void inputsChanged();

 private:
  struct Shared {
    std::atomic<std::size_t> done{0}, total{0};
    std::atomic<int> step{0};
  };
  void startWorker();
  void stopWorker();
  void setStep(Step step);
  void pollProgress();
  void onWorkerEnded(unsigned generation);

  std::vector<SourceFile> sources_;
  ImportOptions import_options_;
  fitting::FitOptions fit_options_;
  fitting::ExtendedFitOptions model_options_ = default_model_options();
  std::optional<Spec> spec_;
  PairOptions pair_options_;
  bool pairing_wanted_ = false;
  bool pair_all_fitted_ = false;
  PairEligibility pairing_eligibility_ = PairEligibility::fitted;
  std::shared_ptr<const LotFit> saved_fit_;

  bool import_stale_ = false;
  bool fit_stale_ = false;
  bool analysis_stale_ = false;
  bool pairing_stale_ = false;

  std::shared_ptr<const ImportResult> import_result_;
  std::shared_ptr<const LotFit> lot_fit_;
  std::shared_ptr<const std::vector<UnitSeries>> curve_series_;
  std::shared_ptr<const LotAnalysis> analysis_;
  std::shared_ptr<const Pairing> pairing_;
  int import_runs_ = 0;
  int fit_runs_ = 0;
  int analysis_runs_ = 0;
  int pairing_runs_ = 0;

  Step step_ = Step::idle;
  unsigned generation_ = 0;
  std::shared_ptr<Shared> shared_;
  std::jthread worker_;
  QTimer poll_timer_;
};

}  // namespace photolot::workbench

#include "session.h"

#include <QMetaObject>

namespace photolot::workbench {

AnalysisSession::AnalysisSession(QObject* parent) : QObject(parent) {
  poll_timer_.setInterval(50);
  connect(&poll_timer_, &QTimer::timeout, this, &AnalysisSession::pollProgress);
}

AnalysisSession::~AnalysisSession() { stopWorker(); }

void AnalysisSession::setSources(std::vector<SourceFile> sources) {
  sources_ = std::move(sources);
  import_stale_ = !sources_.empty();
  fit_stale_ = import_stale_;
  if (sources_.empty()) {
    import_result_.reset();
    lot_fit_.reset();
  }
  emit inputsChanged();
}

void AnalysisSession::setImportOptions(const ImportOptions& options) {
  import_options_ = options;
  import_stale_ = !sources_.empty();
  fit_stale_ = import_stale_;
  emit inputsChanged();
}

void AnalysisSession::setFitOptions(const fitting::FitOptions& options) {
  fit_options_ = options;
  fit_stale_ = import_result_ != nullptr || import_stale_;
  emit inputsChanged();
}

void AnalysisSession::clear() {
  stopWorker();
  setStep(Step::idle);
  sources_.clear();
  import_result_.reset();
  lot_fit_.reset();
  import_stale_ = fit_stale_ = false;
  emit inputsChanged();
  emit importFinished();
  emit fitFinished();
}

void AnalysisSession::run() {
  stopWorker();
  if (!import_stale_ && !fit_stale_) {
    setStep(Step::idle);
    return;
  }
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
  const bool do_import = import_stale_;
  const Step first = do_import ? Step::import : Step::fit;
  shared->step = static_cast<int>(first);
  setStep(first);

  // The worker owns copies of its inputs, so the GUI may change them while it runs.
  std::vector<SourceFile> sources = do_import ? sources_ : std::vector<SourceFile>{};
  ImportOptions import_options = import_options_;
  fitting::FitOptions fit_options = fit_options_;
  std::shared_ptr<const ImportResult> previous_import = import_result_;

  worker_ = std::jthread([this, generation, shared, do_import, sources = std::move(sources),
                          import_options, fit_options,
                          previous_import](std::stop_token stop) mutable {
    auto ended = [this, generation, &stop] {
      const bool stopped = stop.stop_requested();
      QMetaObject::invokeMethod(
          this, [this, generation, stopped] { onWorkerEnded(generation, stopped); },
          Qt::QueuedConnection);
    };
    std::shared_ptr<const ImportResult> imported = previous_import;
    if (do_import) {
      shared->total = sources.size();
      auto result = std::make_shared<ImportResult>(run_import(sources, import_options));
      shared->done = sources.size();
      imported = result;
      if (stop.stop_requested()) return ended();
      QMetaObject::invokeMethod(
          this, [this, generation, result] { onImported(generation, result); },
          Qt::QueuedConnection);
    }
    if (!imported) return ended();
    shared->step = static_cast<int>(Step::fit);
    shared->done = 0;
    shared->total = imported->lot.units.size();
    auto progress = [shared](std::size_t done, std::size_t total) {
      shared->done = done;
      shared->total = total;
    };
    auto fit = std::make_shared<LotFit>(run_fit(imported->lot, fit_options, progress, stop));
    if (!stop.stop_requested()) {
      QMetaObject::invokeMethod(
          this, [this, generation, fit] { onFitted(generation, fit); }, Qt::QueuedConnection);
    }
    ended();
  });
  poll_timer_.start();
}

void AnalysisSession::onImported(unsigned generation, std::shared_ptr<const ImportResult> result) {
  if (generation != generation_) return;
  import_result_ = std::move(result);
  lot_fit_.reset();
  import_stale_ = false;
  ++import_runs_;
  emit importFinished();
}

void AnalysisSession::onFitted(unsigned generation, std::shared_ptr<const LotFit> fit) {
  if (generation != generation_) return;
  lot_fit_ = std::move(fit);
  fit_stale_ = false;
  ++fit_runs_;
  emit fitFinished();
}

void AnalysisSession::onWorkerEnded(unsigned generation, bool stopped) {
  if (generation != generation_) return;
  poll_timer_.stop();
  if (worker_.joinable()) worker_.join();
  pollProgress();
  setStep(Step::idle);
}

}  // namespace photolot::workbench

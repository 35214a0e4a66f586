#include "flapline/studies/trim.hpp"

#include <Eigen/Dense>
#include <Eigen/SVD>
#include <algorithm>
#include <cmath>

#include "flapline/common/errors.hpp"

namespace flapline::studies {
namespace {

/// The residual model: names, targets, scales, and the scaled residual of a run.
struct Residuals {
  std::vector<std::string> names;
  Eigen::VectorXd target, scale;
  bool balance = false;

  Eigen::VectorXd achieved(const RunSummary& s) const {
    Eigen::VectorXd a(static_cast<Eigen::Index>(names.size()));
    if (balance) {
      const Wrench& w = s.vehicle->steady_residual;
      a << w.force, w.moment;
      return a;
    }
    for (std::size_t i = 0; i < names.size(); ++i)
      a(static_cast<Eigen::Index>(i)) = summary_value(s, names[i]);
    return a;
  }
  Eigen::VectorXd scaled(const RunSummary& s) const {
    return ((achieved(s) - target).array() / scale.array()).matrix();
  }
};

double rms(const Eigen::VectorXd& r) {
  return r.size() ? std::sqrt(r.squaredNorm() / static_cast<double>(r.size())) : 0.0;
}

}  // namespace

TrimResult trim(const std::vector<Parameter>& free, const std::vector<Target>& targets,
                const CaseSpec& base, const CaseBuilderFactory& factory,
                const TrimOptions& options) {
  const Eigen::Index n = static_cast<Eigen::Index>(free.size());
  Eigen::VectorXd lo(n), width(n), z(n);
  for (Eigen::Index i = 0; i < n; ++i) {
    const Parameter& p = free[static_cast<std::size_t>(i)];
    lo(i) = p.low;
    width(i) = p.high - p.low;
    z(i) = (p.base - p.low) / width(i);
  }
  auto values_of = [&](const Eigen::VectorXd& zz) -> Eigen::VectorXd {
    Eigen::VectorXd x = lo + (zz.array() * width.array()).matrix();
    for (Eigen::Index i = 0; i < n; ++i)  // the bounds themselves, not lo + 1·width
      if (zz(i) <= 0.0)
        x(i) = lo(i);
      else if (zz(i) >= 1.0)
        x(i) = free[static_cast<std::size_t>(i)].high;
    return x;
  };
  TrimResult out;
  // Runs at points; a failed run (a rule between keys, a blow-up) comes back with its status.
  auto run = [&](const std::vector<Eigen::VectorXd>& points) {
    std::vector<CaseSpec> cases;
    for (const Eigen::VectorXd& zz : points) cases.push_back(case_at(free, values_of(zz), base));
    out.runs += static_cast<int>(cases.size());
    return evaluate(cases, factory, options.runner);
  };

  try {
    // The base run sets the scales; only its failure ends the trim.
    RunSummary current = run({z}).front();
    if (!has_results(current.status))
      throw InputError("trim", std::string(to_string(current.status)), current.message);
    Residuals res;
    res.balance = targets.empty();
    if (res.balance) {
      if (!current.vehicle)
        throw InputError("--balance", "(no vehicle)", "steady flight needs the vehicle section");
      res.names = {"steady_flight_residual.X_N",        "steady_flight_residual.Y_N",
                   "steady_flight_residual.Z_N",        "steady_flight_residual.L_roll_Nm",
                   "steady_flight_residual.M_pitch_Nm", "steady_flight_residual.N_yaw_Nm"};
      res.target = Eigen::VectorXd::Zero(6);
    } else {
      for (const Target& t : targets) res.names.push_back(t.quantity);
      res.target.resize(static_cast<Eigen::Index>(targets.size()));
      for (std::size_t i = 0; i < targets.size(); ++i)
        res.target(static_cast<Eigen::Index>(i)) = targets[i].value;
    }
    double force_scale = 0.0;
    if (current.vehicle) {
      force_scale = current.vehicle->weight;
    } else {
      for (Eigen::Index i = 0; i < res.target.size(); ++i)
        if (quantity_kind(res.names[static_cast<std::size_t>(i)]) == QuantityKind::force)
          force_scale = std::max(force_scale, std::abs(res.target(i)));
      if (force_scale == 0.0) force_scale = current.averages.force_rms;
    }
    if (!(force_scale > 0.0)) force_scale = 1.0;
    const Eigen::VectorXd base_achieved = res.achieved(current);
    res.scale.resize(res.target.size());
    for (Eigen::Index i = 0; i < res.target.size(); ++i) {
      switch (quantity_kind(res.names[static_cast<std::size_t>(i)])) {
        case QuantityKind::force:
          res.scale(i) = force_scale;
          break;
        case QuantityKind::moment:
          res.scale(i) = force_scale * current.derived.span;
          break;
        case QuantityKind::other:
          res.scale(i) = std::max({std::abs(res.target(i)), std::abs(base_achieved(i)), 1e-12});
          break;
      }
    }
    out.quantities = res.names;
    out.targets = res.target;
    out.scale = res.scale;

    Eigen::VectorXd r = res.scaled(current);
    out.history.push_back(rms(r));
    // Jacobian of the scaled residuals in the scaled parameters (central differences, one-sided
    // at a bound), all runs at once.
    auto jacobian = [&](const Eigen::VectorXd& zz, const Eigen::VectorXd& r0) {
      const double h = options.relative_step;
      std::vector<Eigen::VectorXd> points;
      std::vector<std::pair<double, double>> offsets;  // (plus, minus) steps actually taken
      for (Eigen::Index i = 0; i < n; ++i) {
        double plus = h, minus = h;
        if (zz(i) + h > 1.0) plus = 0.0;
        if (zz(i) - h < 0.0) minus = 0.0;
        if (plus == 0.0 && minus == 0.0) plus = 1.0 - zz(i), minus = zz(i);  // a very short range
        offsets.emplace_back(plus, minus);
        if (plus > 0.0) points.push_back(zz + plus * Eigen::VectorXd::Unit(n, i));
        if (minus > 0.0) points.push_back(zz - minus * Eigen::VectorXd::Unit(n, i));
      }
      const std::vector<RunSummary> s = run(points);
      Eigen::MatrixXd J(r0.size(), n);
      std::size_t k = 0;
      for (Eigen::Index i = 0; i < n; ++i) {
        auto [plus, minus] = offsets[static_cast<std::size_t>(i)];
        // A side whose run fails (the model refuses that point) gives a one-sided difference.
        const RunSummary* sp = plus > 0.0 ? &s[k++] : nullptr;
        const RunSummary* sm = minus > 0.0 ? &s[k++] : nullptr;
        if (sp && !has_results(sp->status)) sp = nullptr, plus = 0.0;
        if (sm && !has_results(sm->status)) sm = nullptr, minus = 0.0;
        if (plus + minus == 0.0) {
          const RunSummary& bad = s[k - 1];
          throw InputError("trim", std::string(to_string(bad.status)),
                           "no Jacobian step around the current point runs for " +
                               free[static_cast<std::size_t>(i)].name + ": " + bad.message);
        }
        const Eigen::VectorXd rp = sp ? res.scaled(*sp) : r0;
        const Eigen::VectorXd rm = sm ? res.scaled(*sm) : r0;
        J.col(i) = (rp - rm) / (plus + minus);
      }
      return J;
    };

    double mu = 1e-3;
    Eigen::MatrixXd J = jacobian(z, r);
    for (out.iterations = 0; out.iterations < options.max_iterations;) {
      if (rms(r) <= 1e-14) break;  // round-off
      const Eigen::VectorXd g = J.transpose() * r;
      // Active set: parameters on a bound that the gradient pushes further out stay there.
      std::vector<Eigen::Index> freeidx;
      for (Eigen::Index i = 0; i < n; ++i)
        if (!((z(i) <= 0.0 && g(i) > 0.0) || (z(i) >= 1.0 && g(i) < 0.0))) freeidx.push_back(i);
      if (freeidx.empty()) break;
      const Eigen::Index nf = static_cast<Eigen::Index>(freeidx.size());
      Eigen::MatrixXd Jf(J.rows(), nf);
      for (Eigen::Index j = 0; j < nf; ++j) Jf.col(j) = J.col(freeidx[static_cast<std::size_t>(j)]);
      const Eigen::MatrixXd A = Jf.transpose() * Jf;
      const Eigen::VectorXd gf = Jf.transpose() * r;
      bool accepted = false, tiny = false;
      for (int attempt = 0; attempt < 12 && !accepted; ++attempt) {
        Eigen::MatrixXd M = A;
        const double floor = 1e-12 * std::max(1.0, A.diagonal().maxCoeff());
        for (Eigen::Index j = 0; j < nf; ++j) M(j, j) += mu * std::max(A(j, j), floor) + 1e-300;
        const Eigen::VectorXd d = M.ldlt().solve(-gf);
        Eigen::VectorXd z_new = z;
        for (Eigen::Index j = 0; j < nf; ++j) {
          const Eigen::Index i = freeidx[static_cast<std::size_t>(j)];
          z_new(i) = std::clamp(z(i) + d(j), 0.0, 1.0);
        }
        if ((z_new - z).cwiseAbs().maxCoeff() <= 1e-13) {
          tiny = true;
          break;
        }
        RunSummary trial = run({z_new}).front();
        // A point the model refuses is a rejected step, like one that does not improve.
        const bool ran = has_results(trial.status);
        const Eigen::VectorXd r_new = ran ? res.scaled(trial) : r;
        if (ran && r_new.squaredNorm() < r.squaredNorm()) {
          z = z_new;
          r = r_new;
          current = std::move(trial);
          mu = std::max(mu / 3.0, 1e-12);
          accepted = true;
        } else {
          mu *= 4.0;
        }
      }
      ++out.iterations;
      out.history.push_back(rms(r));
      if (options.on_iteration) options.on_iteration(out.iterations, rms(r));
      if (!accepted || tiny) break;
      J = jacobian(z, r);  // every exit from the loop leaves J at the final z
    }

    out.values = values_of(z);
    out.achieved = res.achieved(current);
    out.residual = rms(r);
    out.summary = current;
    // Unscaled Jacobian: d achieved / d x = scale_row · J / width_col.
    out.jacobian = res.scale.asDiagonal() * J * width.cwiseInverse().asDiagonal();
    const Eigen::JacobiSVD<Eigen::MatrixXd> svd(J);
    const auto& sv = svd.singularValues();
    out.condition = sv.size() && sv(sv.size() - 1) > 0 ? sv(0) / sv(sv.size() - 1)
                                                       : std::numeric_limits<double>::infinity();
    const Eigen::VectorXd g = J.transpose() * r;
    for (Eigen::Index i = 0; i < n; ++i) {
      const Parameter& p = free[static_cast<std::size_t>(i)];
      if (z(i) <= 0.0 && g(i) >= 0.0)
        out.active_bounds.push_back(p.name + " at its lower bound " + shortest(p.low));
      if (z(i) >= 1.0 && g(i) <= 0.0)
        out.active_bounds.push_back(p.name + " at its upper bound " + shortest(p.high));
    }
    if (out.residual <= options.tolerance) {
      out.status = TrimStatus::trimmed;
      out.message = "trimmed: scaled residual " + shortest(out.residual);
    } else if (!out.active_bounds.empty()) {
      out.status = TrimStatus::not_reachable;
      out.message =
          "target not reachable within the bounds (scaled residual " + shortest(out.residual) + ")";
    } else if (res.target.size() > n &&
               (J.transpose() * r).norm() <= 1e-6 * std::max(r.norm(), 1e-300)) {
      out.status = TrimStatus::not_reachable;
      out.message = "least-squares minimum above the tolerance (scaled residual " +
                    shortest(out.residual) + "): more targets than the free keys can meet";
    } else {
      out.status = TrimStatus::not_converged;
      out.message = "no convergence after " + std::to_string(out.iterations) +
                    " iterations (scaled residual " + shortest(out.residual) + ")";
    }
  } catch (const InputError& e) {
    if (e.key() != "trim") throw;
    out.status = TrimStatus::failed;
    out.message = "a run failed (" + e.value() + "): " + e.allowed();
  }
  return out;
}

}  // namespace flapline::studies

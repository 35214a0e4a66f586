#include "flapline/studies/modes.hpp"

#include <Eigen/Dense>
#include <Eigen/Eigenvalues>
#include <algorithm>
#include <cmath>
#include <complex>
#include <cstdio>

#include "flapline/common/errors.hpp"

namespace flapline::studies {
namespace {

std::string text_deg(double rad) {
  char buf[32];
  std::snprintf(buf, sizeof buf, "%.6g", rad * 180.0 / M_PI);
  return buf;
}

Eigen::Matrix3d cross_matrix(const Eigen::Vector3d& a) {
  Eigen::Matrix3d m;
  m << 0, -a.z(), a.y(), a.z(), 0, -a.x(), -a.y(), a.x(), 0;
  return m;
}

}  // namespace

const std::vector<std::string>& LinearModel::state_names() {
  static const std::vector<std::string> n{"u", "v", "w", "p", "q", "r", "phi", "theta"};
  return n;
}

const std::vector<std::string>& LinearModel::state_units() {
  static const std::vector<std::string> u{"m/s",   "m/s",   "m/s", "rad/s",
                                          "rad/s", "rad/s", "rad", "rad"};
  return u;
}

LinearModel linear_model(const LinearModelInput& in) {
  const double m = in.vehicle.mass;
  const Eigen::Matrix3d I = inertia_matrix(in.vehicle);
  const Eigen::Matrix3d Iinv = I.inverse();
  const Eigen::Vector3d& V = in.velocity;
  const Eigen::Vector3d& w = in.rates;
  const double phi = in.vehicle.roll, th = in.vehicle.pitch;
  const double g = kStandardGravity;
  LinearModel out;
  out.A.setZero();
  // Translational: V̇ = F/m + g_B − ω×V.
  out.A.block<3, 3>(0, 0) = in.force_state.leftCols<3>() / m - cross_matrix(w);
  out.A.block<3, 3>(0, 3) = in.force_state.rightCols<3>() / m + cross_matrix(V);
  out.A.block<3, 1>(0, 6) =
      g * Eigen::Vector3d(0.0, std::cos(phi) * std::cos(th), -std::sin(phi) * std::cos(th));
  out.A.block<3, 1>(0, 7) = g * Eigen::Vector3d(-std::cos(th), -std::sin(phi) * std::sin(th),
                                                -std::cos(phi) * std::sin(th));
  // Rotational: ω̇ = I⁻¹(M − ω×Iω); ∂(ω×Iω)/∂ω = [ω]× I − [Iω]×.
  out.A.block<3, 3>(3, 0) = Iinv * in.moment_state.leftCols<3>();
  out.A.block<3, 3>(3, 3) =
      Iinv * (in.moment_state.rightCols<3>() - (cross_matrix(w) * I - cross_matrix(I * w)));
  // Euler-angle kinematics.
  const double q = w.y(), r = w.z();
  const double t = std::tan(th), c2 = std::cos(th) * std::cos(th);
  out.A(6, 3) = 1.0;
  out.A(6, 4) = std::sin(phi) * t;
  out.A(6, 5) = std::cos(phi) * t;
  out.A(6, 6) = (q * std::cos(phi) - r * std::sin(phi)) * t;
  out.A(6, 7) = (q * std::sin(phi) + r * std::cos(phi)) / c2;
  out.A(7, 4) = std::cos(phi);
  out.A(7, 5) = -std::sin(phi);
  out.A(7, 6) = -q * std::sin(phi) - r * std::cos(phi);
  const Eigen::Index k = in.force_control.cols();
  out.B.setZero(8, k);
  if (k > 0) {
    out.B.topRows(3) = in.force_control / m;
    out.B.middleRows(3, 3) = Iinv * in.moment_control;
  }
  return out;
}

std::vector<Mode> flight_modes(const Eigen::Matrix<double, 8, 8>& A, double velocity_scale) {
  const std::vector<int> longitudinal{0, 2, 4, 7}, lateral{1, 3, 5, 6};
  double cross = 0.0;
  for (int i : longitudinal)
    for (int j : lateral) cross = std::max({cross, std::abs(A(i, j)), std::abs(A(j, i))});
  const bool separate = cross <= 1e-9 * A.cwiseAbs().maxCoeff();
  const double vs = std::max(velocity_scale, 1e-9);
  const std::array<double, 8> weight{
      1 / vs, 1 / vs, 1 / vs, vs / kStandardGravity, vs / kStandardGravity, vs / kStandardGravity,
      1.0,    1.0};
  std::vector<Mode> out;
  auto analyse = [&](const std::vector<int>& idx, const std::string& family) {
    const Eigen::Index n = static_cast<Eigen::Index>(idx.size());
    Eigen::MatrixXd sub(n, n);
    for (Eigen::Index i = 0; i < n; ++i)
      for (Eigen::Index j = 0; j < n; ++j)
        sub(i, j) = A(idx[static_cast<std::size_t>(i)], idx[static_cast<std::size_t>(j)]);
    const Eigen::EigenSolver<Eigen::MatrixXd> es(sub);
    for (Eigen::Index e = 0; e < n; ++e) {
      const std::complex<double> l = es.eigenvalues()(e);
      if (l.imag() < 0.0) continue;  // a pair is reported once
      Mode mode;
      mode.family = family;
      mode.real = l.real();
      mode.imag = l.imag();
      mode.natural_frequency = std::abs(l);
      mode.oscillatory = l.imag() > 1e-12 * std::max(1.0, std::abs(l));
      if (!mode.oscillatory) mode.imag = 0.0;
      mode.damping_ratio = mode.natural_frequency > 0 ? -l.real() / mode.natural_frequency : 0.0;
      if (mode.oscillatory) mode.period = 2.0 * M_PI / l.imag();
      if (l.real() < 0) mode.time_to_half = std::log(2.0) / -l.real();
      if (l.real() > 0) mode.time_to_double = std::log(2.0) / l.real();
      std::vector<std::pair<double, int>> parts;
      for (Eigen::Index i = 0; i < n; ++i) {
        const int state = idx[static_cast<std::size_t>(i)];
        parts.emplace_back(
            std::abs(es.eigenvectors()(i, e)) * weight[static_cast<std::size_t>(state)], state);
      }
      const double top = std::max_element(parts.begin(), parts.end())->first;
      std::sort(parts.rbegin(), parts.rend());
      for (const auto& [size, state] : parts)
        if (size >= 0.3 * top && top > 0)
          mode.dominant.push_back(LinearModel::state_names()[static_cast<std::size_t>(state)]);
      out.push_back(mode);
    }
  };
  if (separate) {
    analyse(longitudinal, "longitudinal");
    analyse(lateral, "lateral");
  } else {
    analyse({0, 1, 2, 3, 4, 5, 6, 7}, "coupled");
  }
  return out;
}

std::vector<std::string> mode_warnings(const std::vector<Mode>& modes, const RunSummary& base,
                                       double frequency) {
  std::vector<std::string> out;
  auto text = [](double v) {
    char buf[32];
    std::snprintf(buf, sizeof buf, "%.4g", v);
    return std::string(buf);
  };
  if (base.vehicle) {
    const VehicleBalance& vb = *base.vehicle;
    Eigen::Matrix<double, 6, 1> r;
    r << vb.steady_residual.force / vb.weight,
        vb.steady_residual.moment / (vb.weight * base.derived.span);
    const double rms = std::sqrt(r.squaredNorm() / 6.0);
    if (rms > 1e-6)
      out.push_back("the reference state is not trimmed (scaled steady-flight residual " +
                    text(rms) + "); run flapline trim --balance first");
  }
  const double flap = 2.0 * M_PI * frequency;
  for (const Mode& m : modes)
    if (m.natural_frequency > 0.1 * flap)
      out.push_back("a " + m.family + " mode (|lambda| = " + text(m.natural_frequency) +
                    " rad/s) is not slow compared with the wing-beat (2 pi f = " + text(flap) +
                    " rad/s): the averaging assumption is weak");
  return out;
}

ModesStudy modes_study(const Model& base, const std::vector<Parameter>& controls,
                       const CaseBuilderFactory& factory, const RunnerOptions& options) {
  check_modes_attitude(*base.vehicle());
  std::vector<Parameter> params = Parameter::flight_state();
  params.insert(params.end(), controls.begin(), controls.end());
  const std::vector<std::string> q{"net_mean.X_N",        "net_mean.Y_N",
                                   "net_mean.Z_N",        "net_mean.L_roll_Nm",
                                   "net_mean.M_pitch_Nm", "net_mean.N_yaw_Nm"};
  ModesStudy out;
  out.derivatives = derivatives(params, q, {}, factory, options);
  const DerivativeTable& t = out.derivatives;
  LinearModelInput in;
  in.vehicle = *base.vehicle();
  in.velocity = base.flight().velocity;
  in.rates = base.flight().rates;
  in.force_state = t.value.block(0, 0, 3, 6);
  in.moment_state = t.value.block(3, 0, 3, 6);
  const Eigen::Index k = t.value.cols() - 6;
  in.force_control = t.value.block(0, 6, 3, k);
  in.moment_control = t.value.block(3, 6, 3, k);
  out.linear = linear_model(in);
  out.modes = flight_modes(out.linear.A, std::max(base.flight().velocity.norm(), 1.0));
  out.warnings = mode_warnings(out.modes, t.base, base.frequency());
  return out;
}

void check_modes_attitude(const VehicleSpec& v) {
  if (std::abs(std::abs(v.pitch) - 0.5 * M_PI) < M_PI / 180.0)
    throw InputError("vehicle.attitude.pitch", text_deg(v.pitch),
                     "must stay 1 deg or more away from +-90 deg for flapline modes (the "
                     "Euler-angle kinematics are singular there)");
}

}  // namespace flapline::studies

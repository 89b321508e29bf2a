// Reference solution: a clamped circular sheet of incompressible neo-Hookean
// material pressed by a rigid frictionless sphere.
//
// The sheet (reference radius a, flat) is held at r = a, z = 0. A sphere of
// radius R, whose apex starts at the centre of the sheet, rises by d; its
// centre is then at z = d - R. The sheet is treated as a membrane, so the
// answer depends on a, R and d only: tensions scale with mu h.
//
// Axisymmetric membrane equations in the reference radius rho (any textbook
// treatment of axisymmetric membranes, e.g. Green & Adkins, Large Elastic
// Deformations, 1970, ch. 4, has this form; written out here from the
// equilibrium of a ring element):
//   l1 = ds/drho, l2 = r/rho, l3 = 1/(l1 l2),
//   W(l1, l2) = (l1^2 + l2^2 + l3^2 - 3) / 2 per mu h and reference area,
//   T1 = W1 / l2, T2 = W2 / l1 (tensions per current length, / mu h),
//   dr/ds = cos psi, dz/ds = -sin psi (psi grows as the sheet turns down).
// Tangential equilibrium d(r T1)/ds = T2 dr/ds becomes
//   d(rho W1)/drho = W2 cos psi,
// which holds on and off the sphere because the contact has no friction.
// Off the sphere T1 kappa1 + T2 kappa2 = 0 with kappa1 = dpsi/ds and
// kappa2 = sin psi / r, i.e. W1 dpsi/drho = -W2 sin psi / rho. On the sphere
// r = R sin psi and dpsi/ds = 1/R; the contact pressure (T1 + T2) / R is what
// the sphere supplies and is positive whenever both tensions are.
//
// The equations are integrated in x = ln rho, which removes the 1/rho of the
// regular singular point at the centre and spaces the steps by the local
// length scale. The centre is equibiaxial; a series l1 = l0 + c rho^2 starts
// the integration at rho0 = 1e-3 rho_c, leaving an error of order
// (rho0 / R)^4.
//
// Shooting: for a trial apex stretch l0, the contact edge rho_c is found by
// bracketing so that r(a) = a (more contact turns the meridian further and
// pulls the rim in, so r(a) - a falls with rho_c); the free span's drop then
// fixes the travel d(l0) = R (1 - cos psi_c) + (z(rho_c) - z(a)), which
// grows with l0, and a second bracketing on l0 matches the requested d. Both
// unknowns are thus found by bracketed root finding, which cannot wander off
// to a non-physical branch. (Bracketing on rho_c outside and l0 inside, the
// other order, fails at depth: for a sphere slightly narrower than the ring
// pushed to its full radius, r(a) - a is not monotone in l0 at fixed rho_c,
// and d(rho_c) folds back.)
//
// Full contact: when the rim circle lies on the sphere (R >= a and
// d = R - sqrt(R^2 - a^2); for R = a that is d = R, the sheet laid over the
// whole hemisphere down to the equator, where it meets the clamp) there is
// no free span, and l0 alone is found so that the meridian reaches the rim
// at the sphere's angle there, psi(a) = asin(a / R) (pi / 2 for R = a).
//
// Range of validity (inputs outside are refused): 0 < d <= R, and for
// R >= a also d <= R - sqrt(R^2 - a^2), beyond which the rim circle would
// lie inside the sphere (equality is the full contact above). For R < a the
// sphere may rise to its equator (d = R): the sheet then leaves it on the
// upper hemisphere and spans the gap to the ring freely. The contact edge
// must stay on the upper hemisphere (psi_c < pi/2) and both tensions
// positive (no wrinkling); both are checked during the shooting.
#pragma once

#include <algorithm>
#include <cmath>
#include <functional>
#include <limits>
#include <numbers>
#include <stdexcept>
#include <vector>

namespace plystrain::test {

struct MembranePressSample {
  double reference_radius;    // rho, 0..a
  double r, z;                // deformed position
  double meridional_stretch;  // l1 = ds/drho
  double hoop_stretch;        // l2 = r/rho (l1 at rho = 0)
  bool in_contact;
};

struct MembranePressSolution {
  double contact_edge_reference_radius;      // rho_c, where the sheet leaves the sphere
  double apex_stretch;                       // l1 = l2 at the centre
  std::vector<MembranePressSample> samples;  // increasing rho, rho = 0 .. a inclusive
};

namespace membrane_press_detail {

struct Derivatives {
  double w1, w2, w11, w12;
};

inline Derivatives neo_hookean(double l1, double l2) {
  const double i1 = 1.0 / l1, i2 = 1.0 / l2;
  return {l1 - i1 * i1 * i1 * i2 * i2, l2 - i1 * i1 * i2 * i2 * i2,
          1.0 + 3.0 * i1 * i1 * i1 * i1 * i2 * i2, 2.0 * i1 * i1 * i1 * i2 * i2 * i2};
}

// State along the meridian. On the sphere l2 and z follow from psi.
struct State {
  double l1 = 0.0, l2 = 0.0, psi = 0.0, z = 0.0;
};

struct Geometry {
  double sheet_radius, sphere_radius, travel;
};

// d/dx of (l1, l2, psi, z) with x = ln rho; `on_sphere` replaces the normal
// equilibrium by the sphere's curvature.
inline State rate(const State& s, double rho, bool on_sphere, double sphere_radius) {
  const Derivatives w = neo_hookean(s.l1, s.l2);
  const double cos_psi = std::cos(s.psi), sin_psi = std::sin(s.psi);
  State d;
  d.l2 = s.l1 * cos_psi - s.l2;
  d.l1 = (w.w2 * cos_psi - w.w1 - w.w12 * d.l2) / w.w11;
  d.psi = on_sphere ? rho * s.l1 / sphere_radius : -w.w2 * sin_psi / w.w1;
  d.z = -rho * s.l1 * sin_psi;
  return d;
}

inline State axpy(const State& s, double h, const State& d) {
  return {s.l1 + h * d.l1, s.l2 + h * d.l2, s.psi + h * d.psi, s.z + h * d.z};
}

// On the sphere l2 and z are slaved to psi; re-imposing them after every stage
// keeps the contact samples exactly on the sphere.
inline void project(State& s, double rho, const Geometry& g) {
  s.l2 = g.sphere_radius * std::sin(s.psi) / rho;
  s.z = g.travel - g.sphere_radius * (1.0 - std::cos(s.psi));
}

// slack: a tension vanished (the sheet would wrinkle); overturned: the
// meridian turned past the vertical.
enum class Outcome { taut, slack, overturned, broken };

// A trial apex stretch that is too small lets a tension vanish; too much
// contact for the stretch turns the meridian past the vertical.
inline Outcome classify(const State& s) {
  if (!std::isfinite(s.l1) || !std::isfinite(s.l2) || !std::isfinite(s.psi) || !(s.l1 > 0.0) ||
      !(s.l2 > 0.0)) {
    return Outcome::broken;
  }
  const Derivatives w = neo_hookean(s.l1, s.l2);
  if (!(w.w1 > 0.0) || !(w.w2 > 0.0)) {
    return Outcome::slack;
  }
  // The rim of a full contact over a hemisphere ends exactly at the vertical.
  if (!(s.psi <= 0.5 * std::numbers::pi * (1.0 + 1e-9))) {
    return Outcome::overturned;
  }
  return Outcome::taut;
}

// Classical fourth-order Runge-Kutta in x = ln rho over [rho_from, rho_to].
inline Outcome advance(State& s, double rho_from, double rho_to, bool on_sphere, const Geometry& g,
                    double steps_per_unit_log) {
  const double span = std::log(rho_to / rho_from);
  if (span <= 0.0) {
    return classify(s);
  }
  const int steps = std::max(1, static_cast<int>(std::ceil(span * steps_per_unit_log)));
  const double h = span / steps;
  double x = std::log(rho_from);
  for (int i = 0; i < steps; ++i) {
    auto stage = [&](const State& at, double x_at) {
      State y = at;
      if (on_sphere) {
        project(y, std::exp(x_at), g);
      }
      return rate(y, std::exp(x_at), on_sphere, g.sphere_radius);
    };
    const State k1 = stage(s, x);
    const State k2 = stage(axpy(s, 0.5 * h, k1), x + 0.5 * h);
    const State k3 = stage(axpy(s, 0.5 * h, k2), x + 0.5 * h);
    const State k4 = stage(axpy(s, h, k3), x + h);
    s.l1 += h / 6.0 * (k1.l1 + 2.0 * k2.l1 + 2.0 * k3.l1 + k4.l1);
    s.psi += h / 6.0 * (k1.psi + 2.0 * k2.psi + 2.0 * k3.psi + k4.psi);
    s.l2 += h / 6.0 * (k1.l2 + 2.0 * k2.l2 + 2.0 * k3.l2 + k4.l2);
    s.z += h / 6.0 * (k1.z + 2.0 * k2.z + 2.0 * k3.z + k4.z);
    x += h;
    if (on_sphere) {
      project(s, std::exp(x), g);
    }
    if (const Outcome outcome = classify(s); outcome != Outcome::taut) {
      return outcome;
    }
  }
  return Outcome::taut;
}

// Series at the centre, from substituting l1 = l0 + c rho^2, l2 = l0 + e rho^2,
// psi = (l0 rho + c rho^3 / 3) / R into the tangential equilibrium at order
// rho^2 (derived here; r = R sin psi gives e = c / 3 - l0^3 / (6 R^2)).
inline State centre_series(double apex_stretch, double rho, const Geometry& g) {
  const double l0 = apex_stretch, r2 = g.sphere_radius * g.sphere_radius;
  const Derivatives w = neo_hookean(l0, l0);
  const double hoop_lag = l0 * l0 * l0 / (6.0 * r2);
  const double c =
      (hoop_lag * (3.0 * w.w12 - w.w11) - w.w1 * l0 * l0 / (2.0 * r2)) * 3.0 / (8.0 * w.w11);
  State s;
  s.l1 = l0 + c * rho * rho;
  s.psi = (l0 * rho + c * rho * rho * rho / 3.0) / g.sphere_radius;
  project(s, rho, g);
  return s;
}

struct Shot {
  Outcome outcome = Outcome::broken;
  double hoop_at_rim = 0.0;  // l2(a); the rim condition is l2(a) = 1
  double drop = 0.0;         // z(rho_c) - z(a) along the free span
  double edge_angle = 0.0;   // psi at rho_c
};

// Integrates from the centre to the rim (on the sphere all the way when
// contact_edge >= a); when `samples` is given it is filled at
// rho_i = a i / (n - 1) with z measured from the apex at d.
inline Shot shoot(double apex_stretch, double contact_edge, const Geometry& g,
                  double steps_per_unit_log, std::vector<MembranePressSample>* samples,
                  int sample_count) {
  const double a = g.sheet_radius;
  const double rho0 = 1e-3 * contact_edge;
  State s = centre_series(apex_stretch, rho0, g);
  Shot shot;
  std::vector<double> stops;
  if (samples != nullptr) {
    samples->clear();
    samples->push_back({0.0, 0.0, g.travel, apex_stretch, apex_stretch, true});
    for (int i = 1; i < sample_count; ++i) {
      stops.push_back(a * i / (sample_count - 1));
    }
  } else {
    stops.push_back(a);
  }
  double rho = rho0;
  bool on_sphere = true;
  double z_at_edge = 0.0;
  for (double stop : stops) {
    if (on_sphere && stop > contact_edge) {
      shot.outcome = advance(s, rho, contact_edge, true, g, steps_per_unit_log);
      if (shot.outcome != Outcome::taut) {
        return shot;
      }
      rho = contact_edge;
      on_sphere = false;
      shot.edge_angle = s.psi;
      z_at_edge = s.z;
    }
    if (stop > rho) {
      shot.outcome = advance(s, rho, stop, on_sphere, g, steps_per_unit_log);
      if (shot.outcome != Outcome::taut) {
        return shot;
      }
    }
    rho = std::max(rho, stop);
    if (samples != nullptr) {
      samples->push_back({stop, stop * s.l2, s.z, s.l1, s.l2, on_sphere});
    }
  }
  shot.outcome = Outcome::taut;
  if (on_sphere) {
    // Full contact (contact_edge >= a): the sheet ends on the sphere.
    shot.edge_angle = s.psi;
    z_at_edge = s.z;
  }
  shot.hoop_at_rim = s.l2;
  shot.drop = z_at_edge - s.z;
  return shot;
}

// Root of a sign-changing f on [lo, hi] by the Illinois variant of regula
// falsi, with bisection whenever f cannot be evaluated.
inline double bracketed_root(const std::function<double(double)>& f, double lo, double hi,
                             double f_lo, double f_hi, double tolerance) {
  int side = 0;
  for (int iteration = 0; iteration < 200; ++iteration) {
    double x = (lo * f_hi - hi * f_lo) / (f_hi - f_lo);
    if (!(x > lo && x < hi)) {
      x = 0.5 * (lo + hi);
    }
    double fx = f(x);
    if (!std::isfinite(fx)) {
      x = 0.5 * (lo + hi);
      fx = f(x);
      if (!std::isfinite(fx)) {
        throw std::runtime_error("membrane press: shooting failed inside a bracket");
      }
    }
    if ((fx < 0.0) == (f_lo < 0.0)) {
      lo = x;
      f_lo = fx;
      if (side == -1) f_hi *= 0.5;
      side = -1;
    } else {
      hi = x;
      f_hi = fx;
      if (side == 1) f_lo *= 0.5;
      side = 1;
    }
    if (hi - lo <= tolerance * std::max(1.0, std::abs(hi)) || fx == 0.0) {
      return x;
    }
  }
  throw std::runtime_error("membrane press: shooting did not converge");
}

}  // namespace membrane_press_detail


// steps_per_unit_log: Runge-Kutta steps per unit of ln(rho); the default
// leaves a discretisation error far below 1e-9 in the stretches.
inline MembranePressSolution solve_membrane_press(double sheet_radius, double sphere_radius,
                                                  double travel, int samples = 201,
                                                  double steps_per_unit_log = 400.0) {
  namespace detail = membrane_press_detail;
  const double a = sheet_radius, R = sphere_radius;
  // Travel at which the rim circle lies on the sphere (R >= a only).
  const double wrapped = R >= a ? R - std::sqrt(std::max(R * R - a * a, 0.0)) : R;
  if (!(a > 0.0) || !(R > 0.0) || !(travel > 0.0) || travel > R * (1.0 + 1e-12) ||
      (R >= a && travel > wrapped * (1.0 + 1e-12)) || samples < 2 || !(steps_per_unit_log >= 10.0)) {
    throw std::invalid_argument(
        "membrane press: need a, R > 0, 0 < d <= R, the rim not inside the sphere "
        "(d <= R - sqrt(R^2 - a^2) when R >= a), at least 2 samples and at least 10 steps per "
        "unit ln(rho)");
  }
  const detail::Geometry g{a, R, travel};
  const double nan = std::numeric_limits<double>::quiet_NaN();
  const bool full_contact = R >= a && std::abs(travel - wrapped) <= 1e-12 * R;

  MembranePressSolution solution;
  if (full_contact) {
    // psi(a) grows with l0; overturning before the rim is "too much".
    const double rim_angle = std::asin(std::min(a / R, 1.0));
    auto rim_error = [&](double apex) {
      const detail::Shot shot = detail::shoot(apex, a, g, steps_per_unit_log, nullptr, 0);
      switch (shot.outcome) {
        case detail::Outcome::taut: return shot.edge_angle - rim_angle;
        case detail::Outcome::overturned: return std::numeric_limits<double>::infinity();
        case detail::Outcome::slack: return -std::numeric_limits<double>::infinity();
        case detail::Outcome::broken: return nan;
      }
      return nan;
    };
    double lo = 1.0 + 1e-9, hi = 1.5;
    double f_lo = rim_error(lo), f_hi = rim_error(hi);
    for (int grow = 0; grow < 20 && f_hi < 0.0; ++grow) {
      lo = hi;
      f_lo = f_hi;
      hi = 1.0 + 2.0 * (hi - 1.0);
      f_hi = rim_error(hi);
    }
    // Bisect until both ends are finite, then the Illinois iteration.
    for (int halve = 0; halve < 200 && !(std::isfinite(f_lo) && std::isfinite(f_hi)); ++halve) {
      const double mid = 0.5 * (lo + hi);
      const double f_mid = rim_error(mid);
      if (std::isnan(f_mid) || std::isnan(f_lo) || std::isnan(f_hi)) {
        throw std::runtime_error("membrane press: full-contact shooting failed");
      }
      (f_mid > 0.0 ? hi : lo) = mid;
      (f_mid > 0.0 ? f_hi : f_lo) = f_mid;
    }
    if (!(f_lo < 0.0 && f_hi > 0.0)) {
      throw std::runtime_error("membrane press: no apex stretch reaches the rim in full contact");
    }
    solution.apex_stretch = detail::bracketed_root(rim_error, lo, hi, f_lo, f_hi, 1e-15);
    solution.contact_edge_reference_radius = a;
  } else {
    // For an apex stretch: the contact edge that returns the rim to r = a.
    // r(a) - a falls as the contact grows; a meridian that overturns or goes
    // slack has too much contact for its stretch.
    auto edge_for_apex = [&](double apex) {
      auto rim_error = [&](double edge) {
        const detail::Shot shot = detail::shoot(apex, edge, g, steps_per_unit_log, nullptr, 0);
        if (shot.outcome == detail::Outcome::slack || shot.outcome == detail::Outcome::overturned) {
          return -1.0;
        }
        return shot.outcome == detail::Outcome::taut ? shot.hoop_at_rim - 1.0 : nan;
      };
      // A tiny stretch has a tiny contact zone: start the bracket low enough.
      double lo = 1e-3 * a;
      double f_lo = rim_error(lo);
      for (int shrink = 0; shrink < 4 && !(f_lo > 0.0); ++shrink) {
        lo *= 0.1;
        f_lo = rim_error(lo);
      }
      const double hi = a * (1.0 - 1e-9);
      const double f_hi = rim_error(hi);
      if (!(f_lo > 0.0) || !(f_hi < 0.0)) {
        return nan;
      }
      return detail::bracketed_root(rim_error, lo, hi, f_lo, f_hi, 1e-14);
    };
    auto travel_error = [&](double apex) {
      const double edge = edge_for_apex(apex);
      if (!std::isfinite(edge)) {
        return nan;
      }
      const detail::Shot shot = detail::shoot(apex, edge, g, steps_per_unit_log, nullptr, 0);
      if (shot.outcome != detail::Outcome::taut) {
        return nan;
      }
      const double reached = R * (1.0 - std::cos(shot.edge_angle)) + shot.drop;
      return (reached - travel) / a;
    };
    // The travel grows with the apex stretch: bracket from just above 1
    // (where a stretch too small to shoot with counts as not yet there).
    double excess = 1e-8;
    double f_lo = travel_error(1.0 + excess);
    while (std::isnan(f_lo) && excess < 0.05) {
      excess *= 4.0;
      f_lo = travel_error(1.0 + excess);
    }
    if (!(f_lo < 0.0)) {
      throw std::runtime_error("membrane press: the travel is too small to resolve");
    }
    double lo = 1.0 + excess, hi = 1.0 + 2.0 * excess;
    double f_hi = travel_error(hi);
    while (!(f_hi > 0.0)) {
      if (f_hi < 0.0) {
        lo = hi;
        f_lo = f_hi;
        hi = 1.0 + 2.0 * (hi - 1.0);
        if (hi > 20.0) {
          throw std::runtime_error("membrane press: no apex stretch reaches the requested travel");
        }
        f_hi = travel_error(hi);
        continue;
      }
      // Past the usable range: halve back towards the last good stretch.
      for (int shrink = 0; shrink < 60 && std::isnan(f_hi); ++shrink) {
        hi = 0.5 * (lo + hi);
        f_hi = travel_error(hi);
      }
      if (std::isnan(f_hi)) {
        throw std::runtime_error("membrane press: shooting failed near the requested travel");
      }
    }
    solution.apex_stretch = detail::bracketed_root(travel_error, lo, hi, f_lo, f_hi, 1e-15);
    solution.contact_edge_reference_radius = edge_for_apex(solution.apex_stretch);
  }
  const detail::Shot shot = detail::shoot(solution.apex_stretch, solution.contact_edge_reference_radius, g,
                                          steps_per_unit_log, &solution.samples, samples);
  if (shot.outcome != detail::Outcome::taut) {
    throw std::runtime_error("membrane press: the converged shot could not be repeated");
  }
  for (const MembranePressSample& sample : solution.samples) {
    const double l3 = 1.0 / (sample.meridional_stretch * sample.hoop_stretch);
    if (!(sample.meridional_stretch > l3) || !(sample.hoop_stretch > l3)) {
      throw std::runtime_error("membrane press: a tension became compressive (wrinkling)");
    }
  }
  return solution;
}

}  // namespace plystrain::test

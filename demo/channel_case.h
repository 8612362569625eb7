// The invented case of the demo: a wall-resolved LES of a plane channel of water driven by an
// imposed pressure gradient, with a thin cylinder in the core whose forces are also recorded.
// Every number here is invented for the demo; the orders of magnitude are common practice for a
// channel at a friction Reynolds number of a few hundred.
#pragma once

namespace plateau_demo {

constexpr double kHalfHeight = 0.025;  // delta, m
constexpr double kViscosity = 1.0e-6;  // nu, m^2/s (water near 20 C)
constexpr double kDensity = 998.0;     // rho, kg/m^3
constexpr double kReTau = 420.0;       // the friction Reynolds number the gradient imposes
constexpr double kFrictionVelocity = kReTau * kViscosity / kHalfHeight;          // 0.0168 m/s
constexpr double kWallShear = kDensity * kFrictionVelocity * kFrictionVelocity;  // 0.2817 Pa
// Streamwise momentum balance of the whole channel: tau_w = -(dP/dx) delta.
constexpr double kPressureGradient = -kWallShear / kHalfHeight;  // -11.27 Pa/m

// Wall distances of the probe line's points, m (y+ from 1.7 to 370).
constexpr double kLinePositions[] = {0.0001, 0.0003, 0.0006, 0.001, 0.002, 0.003,
                                     0.005,  0.0075, 0.010,  0.014, 0.018, 0.022};
constexpr int kLinePoints = sizeof(kLinePositions) / sizeof(kLinePositions[0]);

// The cylinder: diameter 2 mm in the core (U about 0.35 m/s); Strouhal number about 0.2 gives
// lift oscillating at 35 Hz. Its forces are coefficients on the core velocity.
constexpr double kSheddingFrequency = 35.0;  // Hz
constexpr double kDragCoefficient = 1.2;
constexpr double kLiftAmplitude = 0.8;

// Start-up: the run starts from a smooth, laminar-like field; means and fluctuations relax to
// their turbulent values over this time scale (s).
constexpr double kStartupTime = 2.5;

}  // namespace plateau_demo

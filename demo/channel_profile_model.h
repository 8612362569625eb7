// The mean-velocity and Reynolds-stress profiles of the demo's channel, in wall units, as
// functions of y+. How they are modelled:
// - U+ is Reichardt's law of the wall (Reichardt 1951: kappa = 0.41, C = 7.8, chi = 11), times
//   an invented "mesh bias" 1 + 0.04 (1 - exp(-y+/60)): the LES overshoots the reference by up to
//   4 % away from the wall, as a coarse LES may. plateau should call that a bias, not noise.
// - -<u'v'>+ follows from the mean streamwise momentum balance of a channel,
//   dU+/dy+ - <u'v'>+ = 1 - y+/Re_tau (Pope 2000, chapter 7; cited from memory), so the total
//   stress balance holds exactly for the model's U+; clipped at zero near the wall.
// - the rms velocities are invented smooth shapes with the usual features: u_rms+ peaking at
//   2.7 near y+ = 15 and falling to about 1 at the centre, v_rms+ growing like a power of y+ near
//   the wall, w_rms+ linearly; all decreasing towards the centre.
// - the integral time scale of the fluctuations grows from the wall to the centre:
//   T = 0.01 s (1 + y+/80).
#pragma once

namespace plateau_demo {

class ChannelProfileModel {
 public:
  static double ReichardtPlus(double y_plus);
  static double MeanVelocityPlus(double y_plus);
  static double MeanVelocityGradientPlus(double y_plus);
  static double ShearStressPlus(double y_plus);  // <u'v'>+, negative
  static double UrmsPlus(double y_plus);
  static double VrmsPlus(double y_plus);
  static double WrmsPlus(double y_plus);
  static double IntegralTime(double y_plus);  // s
};

}  // namespace plateau_demo

/**
 * Step-size adaptation by dual averaging (Nesterov 2009, Math. Program. 120, 221, as adapted by
 * Hoffman & Gelman 2014, JMLR 15, 1593, sec. 3.2, eq. 6): after each iteration with acceptance
 * statistic alpha, H_t = (1 - 1/(t + t0)) H_{t-1} + (delta - alpha) / (t + t0),
 * ln eps_t = mu - sqrt(t) / gamma H_t, and ln eps_bar_t = t^-kappa ln eps_t + (1 - t^-kappa) ln eps_bar_{t-1},
 * with mu = ln(10 eps_0), gamma = 0.05, t0 = 10, kappa = 0.75 (the paper's values).
 */
export class DualAveraging {
  private readonly target: number;
  private mu = 0;
  private t = 0;
  private hBar = 0;
  private logStep = 0;
  private logStepBar = 0;

  /** @param target the acceptance statistic to aim for (delta; 0.8 is common practice for NUTS) */
  constructor(target: number, initialStep: number) {
    this.target = target;
    this.restart(initialStep);
  }

  /** Starts afresh around a new step size, as after a change of the mass matrix. */
  restart(initialStep: number): void {
    this.mu = Math.log(10 * initialStep);
    this.t = 0;
    this.hBar = 0;
    this.logStep = Math.log(initialStep);
    this.logStepBar = 0;
  }

  /** Feeds one acceptance statistic; returns the step size for the next iteration. */
  update(acceptance: number): number {
    const gamma = 0.05;
    const t0 = 10;
    const kappa = 0.75;
    const alpha = Number.isFinite(acceptance) ? Math.min(1, acceptance) : 0;
    this.t++;
    const w = 1 / (this.t + t0);
    this.hBar = (1 - w) * this.hBar + w * (this.target - alpha);
    this.logStep = this.mu - (Math.sqrt(this.t) / gamma) * this.hBar;
    const eta = Math.pow(this.t, -kappa);
    this.logStepBar = eta * this.logStep + (1 - eta) * this.logStepBar;
    return Math.exp(this.logStep);
  }

  /** The averaged step size, used once adaptation ends. */
  finalStep(): number {
    return Math.exp(this.logStepBar);
  }
}

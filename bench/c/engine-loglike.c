/*
 * engine-loglike: a plain C version of Horologium's one-pass semiseparable log-likelihood, used only by
 * the engine benchmark (bench/run-engine.ts) as a speed and accuracy reference. Not part of the package.
 *
 * It runs the same recursion as src/linalg/semiseparable-likelihood.ts, and the same reverse pass as
 * src/linalg/semiseparable-gradient.ts (see the gradient section below), with the same state-space
 * blocks and the same formulas:
 *   - damped random walk: a 1x1 block exp(-dt / tau);
 *   - oscillator: a 2x2 block exp(F dt) = exp(-c dt) [C I + S G] (src/linalg/oscillator-transition.ts),
 *     with C, S summed as power series when |lambda dt^2| < 1, else cos/sin or the two real rates;
 *   - quasi-periodic: two oscillators with eta-corrected frequencies w and 2w (src/kernels/quasi-periodic.ts);
 *   - S <- Phi (S + u u^T / D) Phi^T one block pair at a time, exactly as TransitionLayout.applyCongruence
 *     does for blocks of size 1 and 2;
 *   - sum log D as the log of a running product of pivots kept in range by power-of-two rescalings;
 *   - for one-block kernels (R = 1 and 2) the state in local variables; for more blocks a general loop over
 *     small arrays. (The TS engine writes the recursion out with the state in locals for every layout of
 *     1x1 and 2x2 blocks, src/linalg/unrolled-recursion.ts: V8 keeps locals in registers but bounds-checks
 *     every typed-array access, while gcc keeps these small arrays in L1 and vectorises the short loops.)
 *
 * One evaluation = "build the kernel from its physical parameters + evaluate", like the TypeScript
 * benchmark's `new GaussianProcess(kernel, t, { errors, mean }).logLikelihood(y)`: the inputs are checked
 * (finite, sorted), the times copied and the noise variances errors^2 formed, the values checked, then the
 * recursion runs, subtracting the mean on the fly.
 *
 * Usage:
 *   engine-loglike [--repeat K] [--rounds M] DATAFILE TERM [TERM ...]
 *       times M rounds of K evaluations; prints the log-likelihood and the median ns per point
 *       (process CPU time and wall clock).
 *   engine-loglike --serve DATAFILE TERM [TERM ...]
 *       reads requests "full K", "core K" or "gradient K" on stdin, one per line, runs K evaluations and
 *       answers "LOGL WALL CPU" on stdout (wall-clock and process CPU seconds for all K); used by the
 *       benchmark runner to interleave C and TypeScript timings. "full" is build + check + evaluate; "core"
 *       is the recursion alone on prepared noise variances and residuals; "gradient" is the log-likelihood
 *       and its gradient on the same prepared inputs (forward pass with a tape, backward pass), answered as
 *       "LOGL WALL CPU G1 G2 ..." with d log L / d theta in the order of the terms' parameters.
 *
 * TERM (a sum of terms is the sum of the kernels):
 *   drw:SIGMA:TAU                    sigma^2 exp(-|t| / tau)                        R = 1
 *   osc:SIGMA:PERIOD:QUALITY         stochastically driven damped oscillator        R = 2
 *   qp:SIGMA:PERIOD:DECAY:WEIGHT     quasi-periodic (damped oscillations at P, P/2)  R = 4
 *
 * DATAFILE (little-endian): 8 bytes magic "HORODAT1", uint64 n, float64 mean, then n float64 times,
 * n float64 errors (1 sigma), n float64 values.
 *
 * Build: gcc -O3 -march=native -o bench/build/engine-loglike bench/c/engine-loglike.c -lm
 */
#define _POSIX_C_SOURCE 199309L
#include <math.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>

#define MAX_BLOCKS 64
#define MAX_STATE 128

static const double TWO_PI = 6.283185307179586;

enum block_kind { EXPONENTIAL = 1, OSCILLATOR = 2 };

#define MAX_PARAMETERS 64
#define MAX_DEPENDENCIES 4
#define MAX_DQ 256

/* How a kernel parameter moves a block's native parameters (ParameterDependence in transition-block.ts). */
typedef struct {
  int index;        /* the kernel parameter */
  double d_native;  /* exponential: d rate / d theta; oscillator: d w0 / d theta */
  double d_quality; /* oscillator: d Q / d theta */
} dependence_t;

/* One block of the drift matrix. */
typedef struct {
  enum block_kind kind;
  double rate;       /* exponential: 1 / tau */
  double w0;         /* oscillator: undamped angular frequency */
  double half_width; /* oscillator: c = w0 / (2 Q) */
  double lambda;     /* oscillator: c^2 - w0^2 */
  double quality;    /* oscillator: Q */
  int dependence_count;
  dependence_t dependencies[MAX_DEPENDENCIES];
} block_t;

/* A kernel in semiseparable form, with the layout of its blocks in the state vector. */
typedef struct {
  int block_count;
  int dimension;
  block_t blocks[MAX_BLOCKS];
  int block_start[MAX_BLOCKS];
  int block_size[MAX_BLOCKS];
  int phi_start[MAX_BLOCKS];
  double p[MAX_STATE];
  double q[MAX_STATE];
  int parameter_count;
  /* The non-zero entries of dq / dtheta (the kernel's projectionGradient; p is constant for these kernels),
     by parameter, then by state index. */
  int dq_count;
  int dq_parameter[MAX_DQ], dq_state[MAX_DQ];
  double dq_value[MAX_DQ];
} form_t;

/* One term of the kernel as given on the command line (physical parameters). */
typedef struct {
  char kind[8];
  double value[4];
} term_t;

static _Noreturn void die(const char *message, const char *detail) {
  fprintf(stderr, "engine-loglike: %s%s%s\n", message, detail ? ": " : "", detail ? detail : "");
  exit(2);
}

/* ---------- building the form from physical parameters (mirrors the kernel files in src/kernels) ---------- */

static int add_block(form_t *form, block_t block, int size) {
  if (form->block_count >= MAX_BLOCKS || form->dimension + size > MAX_STATE) die("kernel too large", NULL);
  int b = form->block_count++;
  int phi_length = b == 0 ? 0 : form->phi_start[b - 1] + form->block_size[b - 1] * form->block_size[b - 1];
  form->blocks[b] = block;
  form->block_start[b] = form->dimension;
  form->block_size[b] = size;
  form->phi_start[b] = phi_length;
  int start = form->dimension;
  form->dimension += size;
  return start;
}

/* An oscillator block moved by kernel parameters first + 1 and first + 2 as `second` and `third` say. */
static int add_oscillator(form_t *form, double w0, double quality, double variance, dependence_t second, dependence_t third) {
  block_t block = {OSCILLATOR, 0, w0, w0 / (2 * quality), w0 * w0 * (1 / (4 * quality * quality) - 1), quality, 2,
                   {second, third}};
  int s = add_block(form, block, 2);
  form->p[s] = 1;
  form->p[s + 1] = 0;
  form->q[s] = variance;
  form->q[s + 1] = 0;
  return s;
}

/* One damped oscillation exp(-t / decay) [cos(w t) + sin(w t) / (w decay)] of the quasi-periodic kernel: an
   oscillator with w0 = sqrt(w^2 + 1 / decay^2) and Q = w0 decay / 2 (src/kernels/quasi-periodic.ts). */
static int add_damped_oscillation(form_t *form, double w, double period, double decay, double variance, int first) {
  double a = 1 / decay;
  double w0 = sqrt(w * w + a * a);
  double dw0_dperiod = -(w * w) / (w0 * period);
  dependence_t by_period = {first + 1, dw0_dperiod, (decay / 2) * dw0_dperiod};
  dependence_t by_decay = {first + 2, -(a * a * a) / w0, (w * w) / (2 * w0)};
  return add_oscillator(form, w0, (w0 * decay) / 2, variance, by_period, by_decay);
}

/* dq_i / dtheta_k (the kernel's projectionGradient), entries added by parameter, then state index. */
static void set_projection_gradient(form_t *form, int k, int i, double value) {
  if (form->dq_count >= MAX_DQ) die("kernel too large", NULL);
  form->dq_parameter[form->dq_count] = k;
  form->dq_state[form->dq_count] = i;
  form->dq_value[form->dq_count++] = value;
}

static void require_positive(const char *name, double value) {
  if (!(value > 0) || !isfinite(value)) die("parameter must be positive and finite", name);
}

static void build_form(form_t *form, const term_t *terms, int count) {
  /* Only the counts are reset: every block, p, q and dq entry in use is written when it is added. */
  form->block_count = 0;
  form->dimension = 0;
  form->parameter_count = 0;
  form->dq_count = 0;
  for (int i = 0; i < count; i++) {
    const term_t *term = &terms[i];
    if (strcmp(term->kind, "drw") == 0) {
      double sigma = term->value[0], tau = term->value[1];
      require_positive("sigma", sigma);
      require_positive("tau", tau);
      int first = form->parameter_count;
      form->parameter_count += 2;
      block_t block = {EXPONENTIAL, 1 / tau, 0, 0, 0, 0, 1, {{first + 1, -1 / (tau * tau), 0}}};
      int s = add_block(form, block, 1);
      form->p[s] = 1;
      form->q[s] = sigma * sigma;
      set_projection_gradient(form, first, s, 2 * sigma);
    } else if (strcmp(term->kind, "osc") == 0) {
      double sigma = term->value[0], period = term->value[1], quality = term->value[2];
      require_positive("sigma", sigma);
      require_positive("period", period);
      require_positive("quality", quality);
      int first = form->parameter_count;
      form->parameter_count += 3;
      double w0 = TWO_PI / period;
      dependence_t by_period = {first + 1, -w0 / period, 0}, by_quality = {first + 2, 0, 1};
      int s = add_oscillator(form, w0, quality, sigma * sigma, by_period, by_quality);
      set_projection_gradient(form, first, s, 2 * sigma);
    } else if (strcmp(term->kind, "qp") == 0) {
      double sigma = term->value[0], period = term->value[1], decay = term->value[2], weight = term->value[3];
      require_positive("sigma", sigma);
      require_positive("period", period);
      require_positive("decayTime", decay);
      if (!(weight >= 0 && weight <= 1)) die("harmonicWeight must be in [0, 1]", "harmonicWeight");
      double w = TWO_PI / period;
      double variance = sigma * sigma;
      /* Each block's (w0, Q) moved by period and decayTime (dampedOscillationBlock in quasi-periodic.ts):
         dw0/dP = -w^2 / (w0 P), dQ/dP = (decay / 2) dw0/dP; dw0/dd = -a^3 / w0, dQ/dd = w^2 / (2 w0). */
      int first = form->parameter_count;
      form->parameter_count += 4;
      int s1 = add_damped_oscillation(form, w, period, decay, variance * (1 - weight), first);
      int s2 = add_damped_oscillation(form, 2 * w, period, decay, variance * weight, first);
      set_projection_gradient(form, first, s1, 2 * sigma * (1 - weight));
      set_projection_gradient(form, first, s2, 2 * sigma * weight);
      set_projection_gradient(form, first + 3, s1, -variance);
      set_projection_gradient(form, first + 3, s2, variance);
    } else {
      die("unknown kernel term", term->kind);
    }
    if (form->parameter_count > MAX_PARAMETERS) die("too many kernel parameters", NULL);
  }
}

static void parse_term(const char *text, term_t *term) {
  memset(term, 0, sizeof *term);
  const char *colon = strchr(text, ':');
  if (!colon || colon - text >= (long)sizeof term->kind) die("bad kernel term", text);
  memcpy(term->kind, text, (size_t)(colon - text));
  int expected = strcmp(term->kind, "drw") == 0 ? 2 : strcmp(term->kind, "osc") == 0 ? 3 : 4;
  const char *cursor = colon + 1;
  for (int i = 0; i < expected; i++) {
    char *end;
    term->value[i] = strtod(cursor, &end);
    if (end == cursor) die("bad number in kernel term", text);
    cursor = end;
    if (i + 1 < expected) {
      if (*cursor != ':') die("too few numbers in kernel term", text);
      cursor++;
    }
  }
  if (*cursor != '\0') die("too many numbers in kernel term", text);
}

/* ---------- transitions (mirrors the transition files in src/linalg) ---------- */

/* [exp(-c dt) C, exp(-c dt) S] with C = cosh(sqrt(lambda) dt), S = sinh(sqrt(lambda) dt) / sqrt(lambda). */
/* 1 / (2k)! and 1 / (2k + 1)!, k = 0 .. 10 (filled by init_series): the series of C and S / dt. */
static double cosh_series[11], sinh_series[11];

static void init_series(void) {
  double factorial = 1;
  for (int m = 0; m <= 21; m++) {
    if (m > 0) factorial *= m;
    if (m % 2 == 0) cosh_series[m / 2] = 1 / factorial;
    else sinh_series[m / 2] = 1 / factorial;
  }
}

/* [E C, E S] as dampedHyperbolicValues in src/linalg/oscillator-transition.ts (Horner's rule for |x| < 1). */
static inline void damped_hyperbolic_pair(double c, double lambda, double w0, double dt, double *ec, double *es) {
  double x = lambda * dt * dt;
  if (x > -1 && x < 1) {
    const double *a = cosh_series, *b = sinh_series;
    double c_sum = a[0] + x * (a[1] + x * (a[2] + x * (a[3] + x * (a[4] + x * (a[5] + x * (a[6] + x * (a[7] + x * (a[8] + x * (a[9] + x * a[10])))))))));
    double s_sum = b[0] + x * (b[1] + x * (b[2] + x * (b[3] + x * (b[4] + x * (b[5] + x * (b[6] + x * (b[7] + x * (b[8] + x * (b[9] + x * b[10])))))))));
    double e = exp(-c * dt);
    *ec = e * c_sum;
    *es = e * (dt * s_sum);
    return;
  }
  if (lambda < 0) {
    double omega = sqrt(-lambda);
    double e = exp(-c * dt);
    *ec = e * cos(omega * dt);
    *es = e * (sin(omega * dt) / omega);
  } else {
    double root = sqrt(lambda);
    double fast_rate = c + root;
    double slow_rate = (w0 * w0) / fast_rate;
    double slow = exp(-slow_rate * dt);
    double fast = exp(-fast_rate * dt);
    *ec = 0.5 * (slow + fast);
    *es = (slow - fast) / (2 * root);
  }
}

static inline void compute_transitions(const form_t *form, double dt, double *phi) {
  for (int b = 0; b < form->block_count; b++) {
    const block_t *block = &form->blocks[b];
    double *out = phi + form->phi_start[b];
    if (block->kind == EXPONENTIAL) {
      out[0] = exp(-block->rate * dt);
    } else {
      double ec, es;
      damped_hyperbolic_pair(block->half_width, block->lambda, block->w0, dt, &ec, &es);
      double c = block->half_width, w0 = block->w0;
      out[0] = ec + es * c;
      out[1] = es * w0;
      out[2] = -es * w0;
      out[3] = ec - es * c;
    }
  }
}

/* x[start + k stride] <- Phi x[start + k stride], k = 0..R-1, block by block (f <- Phi f uses stride 1). */
static inline void apply_strided(const form_t *form, const double *phi, double *x, int start, int stride) {
  for (int b = 0; b < form->block_count; b++) {
    int s = start + form->block_start[b] * stride;
    const double *a = phi + form->phi_start[b];
    if (form->block_size[b] == 1) {
      x[s] *= a[0];
    } else {
      double x0 = x[s], x1 = x[s + stride];
      x[s] = a[0] * x0 + a[1] * x1;
      x[s + stride] = a[2] * x0 + a[3] * x1;
    }
  }
}

/*
 * S <- Phi S Phi^T one block pair (a, b) at a time, S_ab <- Phi_a S_ab Phi_b^T, left product first: the same
 * operations in the same order as TransitionLayout's block-pair congruence.
 */
static inline void apply_congruence(const form_t *form, const double *phi, double *s) {
  const int r = form->dimension;
  const int count = form->block_count;
  for (int a = 0; a < count; a++) {
    const double *pa = phi + form->phi_start[a];
    double *row = s + form->block_start[a] * r;
    if (form->block_size[a] == 1) {
      const double g = pa[0];
      for (int b = 0; b < count; b++) {
        const double *pb = phi + form->phi_start[b];
        double *x = row + form->block_start[b];
        if (form->block_size[b] == 1) {
          x[0] = pb[0] * (g * x[0]);
        } else {
          double y0 = g * x[0], y1 = g * x[1];
          x[0] = pb[0] * y0 + pb[1] * y1;
          x[1] = pb[2] * y0 + pb[3] * y1;
        }
      }
    } else {
      const double a00 = pa[0], a01 = pa[1], a10 = pa[2], a11 = pa[3];
      for (int b = 0; b < count; b++) {
        const double *pb = phi + form->phi_start[b];
        double *x = row + form->block_start[b];
        double *x2 = x + r;
        if (form->block_size[b] == 1) {
          const double g = pb[0];
          double x0 = x[0], x1 = x2[0];
          x[0] = g * (a00 * x0 + a01 * x1);
          x2[0] = g * (a10 * x0 + a11 * x1);
        } else {
          double x00 = x[0], x01 = x[1], x10 = x2[0], x11 = x2[1];
          double y00 = a00 * x00 + a01 * x10, y01 = a00 * x01 + a01 * x11;
          double y10 = a10 * x00 + a11 * x10, y11 = a10 * x01 + a11 * x11;
          x[0] = pb[0] * y00 + pb[1] * y01;
          x[1] = pb[2] * y00 + pb[3] * y01;
          x2[0] = pb[0] * y10 + pb[1] * y11;
          x2[1] = pb[2] * y10 + pb[3] * y11;
        }
      }
    }
  }
}

/* ---------- the one-pass log-likelihood (mirrors semiseparableLogLikelihood) ---------- */

static const double HALF_LOG_TWO_PI = 0.91893853320467274178;

/*
 * sum log D = log(product) + exponent ln 2: pivots multiplied into a running product kept within
 * [1e-150, 1e150] by exact power-of-two rescalings counted in a binary exponent (pivot-product.ts).
 */
static const double PIVOT_LOW = 1e-100, PIVOT_HIGH = 1e100;
static const double PRODUCT_LOW = 1e-150, PRODUCT_HIGH = 1e150;
#define PIVOT_SCALE_BITS 332
#define PRODUCT_SCALE_BITS 498

/* Multiplies one pivot into the running product (absorbPivot in pivot-product.ts). */
#define FOLD_PIVOT(pivot)                                                           \
  do {                                                                              \
    double scaled = (pivot);                                                        \
    if (!(scaled > PIVOT_LOW && scaled < PIVOT_HIGH)) {                             \
      while (scaled > PIVOT_HIGH) { scaled *= 0x1p-332; exponent += PIVOT_SCALE_BITS; } \
      while (scaled < PIVOT_LOW) { scaled *= 0x1p332; exponent -= PIVOT_SCALE_BITS; }   \
    }                                                                               \
    product *= scaled;                                                              \
    if (!(product > PRODUCT_LOW && product < PRODUCT_HIGH)) {                       \
      if (product > 1) { product *= 0x1p-498; exponent += PRODUCT_SCALE_BITS; }     \
      else { product *= 0x1p498; exponent -= PRODUCT_SCALE_BITS; }                  \
    }                                                                               \
  } while (0)

/* log det from the running product and binary exponent (logDeterminantOf). */
#define LOG_DETERMINANT() (log(product) + exponent * 0.6931471805599453)

static double not_positive_definite(size_t k, double pivot) {
  fprintf(stderr, "engine-loglike: not positive definite at point %zu (pivot %g)\n", k, pivot);
  return NAN;
}

/*
 * Point k's pivot D and innovation z taken in, as every recursion does: D must be positive (else NaN is
 * returned), 1 / D and z are kept for the next point, z^2 / D is summed and D folded into log det.
 */
#define TAKE_PIVOT(k, pivot, innovation)                                      \
  do {                                                                        \
    if (!((pivot) > 0) || !isfinite(pivot)) return not_positive_definite((k), (pivot)); \
    previous_inverse = 1 / (pivot);                                           \
    previous_z = (innovation);                                                \
    quadratic += previous_z * previous_z * previous_inverse;                  \
    FOLD_PIVOT(pivot);                                                        \
  } while (0)

/* p^T q, the process variance k(0), summed from 0 in index order as the TypeScript does. */
static inline double stationary_variance(int r, const double *p, const double *q) {
  double variance = 0;
  for (int i = 0; i < r; i++) variance += p[i] * q[i];
  return variance;
}

/* The state before the first point: S = 0, f = 0, u = 0. */
static inline void zero_state(int r, double *s, double *f, double *u) {
  memset(s, 0, sizeof(double) * (size_t)(r * r));
  memset(f, 0, sizeof(double) * (size_t)r);
  memset(u, 0, sizeof(double) * (size_t)r);
}

/* S += u u^T / D and f += u z / D for the previous point's gain u, pivot D and innovation z (absorb). */
static inline void absorb_previous(int r, const double *u, double previous_inverse, double previous_z, double *s, double *f) {
  for (int i = 0; i < r; i++) {
    double ui = u[i] * previous_inverse;
    double *row = s + i * r;
    for (int j = 0; j < r; j++) row[j] += ui * u[j];
    f[i] += ui * previous_z;
  }
}

/* u = q - S p, with p^T S p and p^T f, every sum from its first term, as projectState. */
static inline void project_state(int r, const double *p, const double *q, const double *s, const double *f, double *u,
                                 double *p_s_p, double *p_f) {
  double ps = 0, pf = 0;
  for (int i = 0; i < r; i++) {
    const double *row = s + i * r;
    double sp = row[0] * p[0];
    for (int j = 1; j < r; j++) sp += row[j] * p[j];
    u[i] = q[i] - sp;
    if (i == 0) {
      ps = p[0] * sp;
      pf = p[0] * f[0];
    } else {
      ps += p[i] * sp;
      pf += p[i] * f[i];
    }
  }
  *p_s_p = ps;
  *p_f = pf;
}

static double general_recursion(const form_t *form, size_t n, const double *time, const double *noise,
                                const double *residual, double mean) {
  const int r = form->dimension;
  const double *p = form->p;
  const double *q = form->q;
  const double variance = stationary_variance(r, p, q);
  double s[MAX_STATE * MAX_STATE];
  double f[MAX_STATE], u[MAX_STATE], phi[MAX_STATE * 2];
  zero_state(r, s, f, u);
  double quadratic = 0, exponent = 0, product = 1, previous_inverse = 0, previous_z = 0;
  for (size_t k = 0; k < n; k++) {
    if (k > 0) {
      absorb_previous(r, u, previous_inverse, previous_z, s, f);
      compute_transitions(form, time[k] - time[k - 1], phi);
      apply_congruence(form, phi, s);
      apply_strided(form, phi, f, 0, 1);
    }
    double p_s_p, p_f;
    project_state(r, p, q, s, f, u, &p_s_p, &p_f);
    double pivot = noise[k] + variance - p_s_p;
    TAKE_PIVOT(k, pivot, (residual[k] - mean) - p_f);
  }
  return -0.5 * (quadratic + LOG_DETERMINANT()) - (double)n * HALF_LOG_TWO_PI;
}


/*
 * One 1 x 1 block (R = 1) with the state in local variables, as semiseparableLogLikelihood's advanceOne:
 * the same operations in the same order as the general loop.
 */
static double one_block_recursion(const form_t *form, size_t n, const double *time, const double *noise,
                                  const double *residual, double mean) {
  const double p0 = form->p[0], q0 = form->q[0];
  const double variance = 0 + p0 * q0;
  double s = 0, f = 0, u = 0, phi[4];
  double quadratic = 0, exponent = 0, product = 1, previous_inverse = 0, previous_z = 0;
  for (size_t k = 0; k < n; k++) {
    if (k > 0) {
      double ui = u * previous_inverse;
      s += ui * u;
      f += ui * previous_z;
      compute_transitions(form, time[k] - time[k - 1], phi);
      double g = phi[0];
      s = g * (g * s);
      f *= g;
    }
    double sp = s * p0;
    u = q0 - sp;
    double pivot = noise[k] + variance - p0 * sp;
    TAKE_PIVOT(k, pivot, (residual[k] - mean) - p0 * f);
  }
  return -0.5 * (quadratic + LOG_DETERMINANT()) - (double)n * HALF_LOG_TWO_PI;
}

/* One 2 x 2 block (R = 2) with the state in local variables, as advanceTwo. */
static double two_block_recursion(const form_t *form, size_t n, const double *time, const double *noise,
                                  const double *residual, double mean) {
  const double p0 = form->p[0], p1 = form->p[1], q0 = form->q[0], q1 = form->q[1];
  const double variance = 0 + p0 * q0 + p1 * q1;
  double s00 = 0, s01 = 0, s10 = 0, s11 = 0, f0 = 0, f1 = 0, u0 = 0, u1 = 0, phi[4];
  double quadratic = 0, exponent = 0, product = 1, previous_inverse = 0, previous_z = 0;
  for (size_t k = 0; k < n; k++) {
    if (k > 0) {
      double a0 = u0 * previous_inverse, a1 = u1 * previous_inverse;
      s00 += a0 * u0;
      s01 += a0 * u1;
      s10 += a1 * u0;
      s11 += a1 * u1;
      f0 += a0 * previous_z;
      f1 += a1 * previous_z;
      compute_transitions(form, time[k] - time[k - 1], phi);
      double b00 = phi[0], b01 = phi[1], b10 = phi[2], b11 = phi[3];
      double y00 = b00 * s00 + b01 * s10, y01 = b00 * s01 + b01 * s11;
      double y10 = b10 * s00 + b11 * s10, y11 = b10 * s01 + b11 * s11;
      s00 = b00 * y00 + b01 * y01;
      s01 = b10 * y00 + b11 * y01;
      s10 = b00 * y10 + b01 * y11;
      s11 = b10 * y10 + b11 * y11;
      double g0 = b00 * f0 + b01 * f1;
      f1 = b10 * f0 + b11 * f1;
      f0 = g0;
    }
    double sp0 = s00 * p0 + s01 * p1, sp1 = s10 * p0 + s11 * p1;
    u0 = q0 - sp0;
    u1 = q1 - sp1;
    double p_s_p = p0 * sp0 + p1 * sp1;
    double p_f = p0 * f0 + p1 * f1;
    double pivot = noise[k] + variance - p_s_p;
    TAKE_PIVOT(k, pivot, (residual[k] - mean) - p_f);
  }
  return -0.5 * (quadratic + LOG_DETERMINANT()) - (double)n * HALF_LOG_TWO_PI;
}

/*
 * The log-likelihood: the one-block recursions with the state in locals for R = 1 and 2, the general loop
 * otherwise. residual[k] - mean enters the recursion: "core" passes prepared residuals and mean 0, "full"
 * the values and their mean, as the TypeScript GaussianProcess does (no array of residuals is formed).
 */
static double recursion(const form_t *form, size_t n, const double *time, const double *noise, const double *residual,
                        double mean) {
  if (form->block_count == 1 && form->block_size[0] == 1) return one_block_recursion(form, n, time, noise, residual, mean);
  if (form->block_count == 1 && form->block_size[0] == 2) return two_block_recursion(form, n, time, noise, residual, mean);
  return general_recursion(form, n, time, noise, residual, mean);
}

/* ---------- the gradient: forward pass with a tape, backward pass (mirrors src/linalg/semiseparable-gradient.ts) ---------- */

/*
 * The same stages, operations and order as the TypeScript gradient's general loops
 * (gradient-general-loop.ts, transition-adjoints.ts; the written-out passes are bit-identical to them):
 * the forward recursion records per point A_k = S_{k-1} + u u^T / D (upper triangle), g_k, each block's
 * transition record (exponential: Phi; oscillator: E C, E S, E dS/dlambda), u_k, 1 / D_k, z_k; the backward
 * pass carries S-bar (upper triangle), f-bar, u-bar, D-bar, z-bar from the last point to the first and
 * contracts each block's Phi-bar into running sums; the sums then map to the kernel parameters.
 */

/* (k + 1) / (2k + 3)!, k = 0 .. 10 (filled by init_series): E dS/dlambda = E dt^3 sum_k (k + 1) x^k / (2k + 3)!. */
static double sinh_lambda_series[11];

static void init_gradient_series(void) {
  for (int k = 0; k <= 10; k++) {
    double factorial = 1;
    for (int i = 2; i <= 2 * k + 3; i++) factorial *= i;
    sinh_lambda_series[k] = (k + 1) / factorial;
  }
}

/* Offsets of one point's record and of the running adjoints (GradientTapeLayout). */
typedef struct {
  int r, packed_length, width;
  int mean_before, block_record[MAX_BLOCKS], gain, inverse_pivot, innovation;
  int mean_bar, gain_bar, pivot_bar, innovation_bar, gain_bar_sum, noise_bar_sum, residual_bar_sum;
  int accumulators[MAX_BLOCKS], adjoint_length;
} tape_layout_t;

static void tape_layout(const form_t *form, tape_layout_t *t) {
  int r = form->dimension;
  t->r = r;
  t->packed_length = r * (r + 1) / 2;
  t->mean_before = t->packed_length;
  int offset = t->mean_before + r;
  for (int b = 0; b < form->block_count; b++) {
    t->block_record[b] = offset;
    offset += form->blocks[b].kind == EXPONENTIAL ? 1 : 3;
  }
  t->gain = offset;
  t->inverse_pivot = offset + r;
  t->innovation = offset + r + 1;
  t->width = offset + r + 2;
  t->mean_bar = t->packed_length;
  t->gain_bar = t->mean_bar + r;
  t->pivot_bar = t->gain_bar + r;
  t->innovation_bar = t->pivot_bar + 1;
  t->gain_bar_sum = t->innovation_bar + 1;
  t->noise_bar_sum = t->gain_bar_sum + r;
  t->residual_bar_sum = t->noise_bar_sum + 1;
  int accumulator = t->residual_bar_sum + 1;
  for (int b = 0; b < form->block_count; b++) {
    t->accumulators[b] = accumulator;
    accumulator += form->blocks[b].kind == EXPONENTIAL ? 1 : 6;
  }
  t->adjoint_length = accumulator;
}

/* The tape, kept between evaluations as the TypeScript GaussianProcess keeps it (gradientWorkspace). */
static double *tape_memory = NULL;
static size_t tape_capacity = 0;

static double *tape_of(size_t length) {
  if (length > tape_capacity) {
    free(tape_memory);
    tape_memory = malloc(sizeof(double) * length);
    if (!tape_memory) die("out of memory", NULL);
    tape_capacity = length;
  }
  return tape_memory;
}

/* Phi and the record of one block (recordTransition): glibc's exp, cos, sin, as the forward pass here. */
static inline void record_transition(const block_t *block, double dt, double *phi, double *record) {
  if (block->kind == EXPONENTIAL) {
    phi[0] = exp(-block->rate * dt);
    record[0] = phi[0];
    return;
  }
  double ec, es, esl;
  double c = block->half_width, lambda = block->lambda, w0 = block->w0;
  damped_hyperbolic_pair(c, lambda, w0, dt, &ec, &es);
  double x = lambda * dt * dt;
  if (x > -1 && x < 1) {
    const double *d = sinh_lambda_series;
    double sum = d[0] + x * (d[1] + x * (d[2] + x * (d[3] + x * (d[4] + x * (d[5] + x * (d[6] + x * (d[7] + x * (d[8] + x * (d[9] + x * d[10])))))))));
    esl = exp(-c * dt) * (dt * dt * dt * sum);
  } else {
    esl = (dt * ec - es) / (2 * lambda);
  }
  phi[0] = ec + es * c;
  phi[1] = es * w0;
  phi[2] = -es * w0;
  phi[3] = ec - es * c;
  record[0] = ec;
  record[1] = es;
  record[2] = esl;
}

/* Stage 1: the likelihood's recursion (general_recursion's operations), writing the tape. */
static double forward_with_tape(const form_t *form, const tape_layout_t *t, double *tape, size_t n, const double *time,
                                const double *noise, const double *residual, double mean) {
  const int r = form->dimension;
  const double *p = form->p, *q = form->q;
  const double variance = stationary_variance(r, p, q);
  double s[MAX_STATE * MAX_STATE], f[MAX_STATE], u[MAX_STATE], phi[MAX_STATE * 2];
  zero_state(r, s, f, u);
  double quadratic = 0, exponent = 0, product = 1, previous_inverse = 0, previous_z = 0;
  for (size_t k = 0; k < n; k++) {
    double *record = tape + k * (size_t)t->width;
    if (k > 0) {
      absorb_previous(r, u, previous_inverse, previous_z, s, f);
      int index = 0;
      for (int i = 0; i < r; i++)
        for (int j = i; j < r; j++) record[index++] = s[i * r + j];
      for (int i = 0; i < r; i++) record[t->mean_before + i] = f[i];
      double dt = time[k] - time[k - 1];
      for (int b = 0; b < form->block_count; b++)
        record_transition(&form->blocks[b], dt, phi + form->phi_start[b], record + t->block_record[b]);
      apply_congruence(form, phi, s);
      apply_strided(form, phi, f, 0, 1);
    }
    double p_s_p, p_f;
    project_state(r, p, q, s, f, u, &p_s_p, &p_f);
    double pivot = noise[k] + variance - p_s_p;
    TAKE_PIVOT(k, pivot, (residual[k] - mean) - p_f);
    for (int i = 0; i < r; i++) record[t->gain + i] = u[i];
    record[t->inverse_pivot] = previous_inverse;
    record[t->innovation] = previous_z;
  }
  return -0.5 * (quadratic + LOG_DETERMINANT()) - (double)n * HALF_LOG_TWO_PI;
}

/*
 * Stage 2: the backward pass (backwardGeneralLoop), all points; `adjoint` starts at zero. S-bar and A_k are
 * kept as full symmetric matrices here (each element of the upper triangle computed once, as in the
 * TypeScript, and mirrored), so that the loops index them directly.
 */
static void backward(const form_t *form, const tape_layout_t *t, const double *tape, size_t n, const double *time,
                     double *adjoint) {
  const int r = form->dimension;
  const double *p = form->p;
  double sb[MAX_STATE * MAX_STATE], state_before[MAX_STATE * MAX_STATE];
  double product[MAX_STATE * MAX_STATE], phi[MAX_STATE * 2], phi_bar[4], vector[MAX_STATE];
  memset(sb, 0, sizeof(double) * (size_t)(r * r));
  double *fb = adjoint + t->mean_bar, *ub = adjoint + t->gain_bar;
  for (size_t k = n; k-- > 0;) {
    const double *record = tape + k * (size_t)t->width;
    double inverse_pivot = record[t->inverse_pivot], z = record[t->innovation];
    double w = z * inverse_pivot;
    double z_bar = adjoint[t->innovation_bar] - w;
    double d_bar = adjoint[t->pivot_bar] + 0.5 * (w * w - inverse_pivot);
    adjoint[t->residual_bar_sum] += z_bar;
    adjoint[t->noise_bar_sum] += d_bar;
    for (int i = 0; i < r; i++) {
      adjoint[t->gain_bar_sum + i] += ub[i];
      fb[i] -= z_bar * p[i];
    }
    for (int i = 0; i < r; i++)
      for (int j = i; j < r; j++) {
        double value = sb[i * r + j] - (d_bar * (p[i] * p[j]) + 0.5 * (ub[i] * p[j] + p[i] * ub[j]));
        sb[i * r + j] = value;
        sb[j * r + i] = value;
      }
    if (k == 0) break;

    double dt = time[k] - time[k - 1];
    for (int b = 0; b < form->block_count; b++) {
      const block_t *block = &form->blocks[b];
      const double *rec = record + t->block_record[b];
      double *a = phi + form->phi_start[b];
      if (block->kind == EXPONENTIAL) {
        a[0] = rec[0];
      } else {
        a[0] = rec[0] + rec[1] * block->half_width;
        a[1] = rec[1] * block->w0;
        a[2] = -rec[1] * block->w0;
        a[3] = rec[0] - rec[1] * block->half_width;
      }
    }
    {
      int index = 0;
      for (int i = 0; i < r; i++)
        for (int j = i; j < r; j++) {
          state_before[i * r + j] = record[index];
          state_before[j * r + i] = record[index++];
        }
    }
    /* N = S-bar Phi. */
    for (int b = 0; b < form->block_count; b++) {
      int start = form->block_start[b], m = form->block_size[b];
      const double *a = phi + form->phi_start[b];
      for (int i = 0; i < r; i++)
        for (int j = 0; j < m; j++) {
          double sum = sb[i * r + start] * a[j];
          for (int l = 1; l < m; l++) sum += sb[i * r + start + l] * a[l * m + j];
          product[i * r + start + j] = sum;
        }
    }
    /* Phi-bar = 2 N A + f-bar g^T per block, into the block's running sums. */
    for (int b = 0; b < form->block_count; b++) {
      const block_t *block = &form->blocks[b];
      int start = form->block_start[b], m = form->block_size[b];
      for (int i = 0; i < m; i++)
        for (int j = 0; j < m; j++) {
          int row = start + i, column = start + j;
          double sum = product[row * r] * state_before[column];
          for (int l = 1; l < r; l++) sum += product[row * r + l] * state_before[l * r + column];
          phi_bar[i * m + j] = 2 * sum + fb[row] * record[t->mean_before + column];
        }
      double *acc = adjoint + t->accumulators[b];
      const double *a = phi + form->phi_start[b];
      if (block->kind == EXPONENTIAL) {
        acc[0] += phi_bar[0] * (dt * a[0]);
      } else {
        const double *rec = record + t->block_record[b];
        double es = rec[1], esl = rec[2];
        double ecl = 0.5 * dt * es;
        double p00 = phi_bar[0], p11 = phi_bar[3];
        double pd = phi_bar[1] - phi_bar[2], ps = p00 + p11, pm = p00 - p11;
        acc[0] += dt * (p00 * a[0] + pd * a[1] + p11 * a[3]);
        acc[1] += ps * ecl;
        acc[2] += pm * esl;
        acc[3] += pd * esl;
        acc[4] += pm * es;
        acc[5] += pd * es;
      }
    }
    /* A-bar = Phi^T N (upper triangle, mirrored) into S-bar, g-bar = Phi^T f-bar into f-bar. */
    for (int b = 0; b < form->block_count; b++) {
      int start = form->block_start[b], m = form->block_size[b];
      const double *a = phi + form->phi_start[b];
      for (int i = start; i < start + m; i++) {
        for (int j = i; j < r; j++) {
          double sum = a[i - start] * product[start * r + j];
          for (int l = 1; l < m; l++) sum += a[l * m + (i - start)] * product[(start + l) * r + j];
          sb[i * r + j] = sum;
          sb[j * r + i] = sum;
        }
        double sum = a[i - start] * fb[start];
        for (int l = 1; l < m; l++) sum += a[l * m + (i - start)] * fb[start + l];
        vector[i] = sum;
      }
    }
    memcpy(fb, vector, sizeof(double) * (size_t)r);
    /* Through A = S_{k-1} + u u^T / D and g = f_{k-1} + u z / D of point k - 1. */
    const double *previous = record - t->width;
    double previous_inverse = previous[t->inverse_pivot], previous_z = previous[t->innovation];
    const double *u = previous + t->gain;
    double u_a_u = 0, ug = 0;
    for (int i = 0; i < r; i++) {
      double sum = sb[i * r] * u[0];
      for (int j = 1; j < r; j++) sum += sb[i * r + j] * u[j];
      vector[i] = sum;
      if (i == 0) {
        u_a_u = u[0] * sum;
        ug = u[0] * fb[0];
      } else {
        u_a_u += u[i] * sum;
        ug += u[i] * fb[i];
      }
    }
    for (int i = 0; i < r; i++) ub[i] = (2 * vector[i] + previous_z * fb[i]) * previous_inverse;
    adjoint[t->pivot_bar] = -(u_a_u + previous_z * ug) * (previous_inverse * previous_inverse);
    adjoint[t->innovation_bar] = ug * previous_inverse;
  }
}

/* Stage 3: the running sums mapped to the kernel parameters (finishBlockAdjoint, assembleKernelGradient). */
static void assemble(const form_t *form, const tape_layout_t *t, const double *adjoint, double *gradient) {
  const int r = form->dimension;
  for (int c = 0; c < form->parameter_count; c++) gradient[c] = 0;
  for (int b = 0; b < form->block_count; b++) {
    const block_t *block = &form->blocks[b];
    const double *acc = adjoint + t->accumulators[b];
    if (block->kind == EXPONENTIAL) {
      double rate_bar = -acc[0];
      for (int d = 0; d < block->dependence_count; d++)
        gradient[block->dependencies[d].index] += rate_bar * block->dependencies[d].d_native;
    } else {
      double c = block->half_width, w0 = block->w0, q = block->quality;
      double tsum = acc[1] + c * acc[2] + w0 * acc[3];
      double c_bar = -acc[0] + 2 * c * tsum + acc[4], w_bar = -2 * w0 * tsum + acc[5];
      for (int d = 0; d < block->dependence_count; d++) {
        const dependence_t *dep = &block->dependencies[d];
        double d_c = dep->d_native / (2 * q) - (w0 * dep->d_quality) / (2 * q * q);
        gradient[dep->index] += c_bar * d_c + w_bar * dep->d_native;
      }
    }
  }
  double noise_sum = adjoint[t->noise_bar_sum];
  for (int e = 0; e < form->dq_count; e++) {
    int i = form->dq_state[e];
    double q_bar = adjoint[t->gain_bar_sum + i] + noise_sum * form->p[i];
    gradient[form->dq_parameter[e]] += q_bar * form->dq_value[e];
  }
  (void)r;
}

/* log L and its gradient with respect to the kernel parameters (into `gradient`), on prepared inputs. */
static double gradient_recursion(const form_t *form, size_t n, const double *time, const double *noise,
                                 const double *residual, double mean, double *gradient) {
  tape_layout_t t;
  tape_layout(form, &t);
  double *tape = tape_of((n ? n : 1) * (size_t)t.width);
  double value = forward_with_tape(form, &t, tape, n, time, noise, residual, mean);
  double adjoint[MAX_STATE * (MAX_STATE + 1) / 2 + 8 * MAX_STATE + 6 * MAX_BLOCKS];
  memset(adjoint, 0, sizeof(double) * (size_t)t.adjoint_length);
  backward(form, &t, tape, n, time, adjoint);
  assemble(form, &t, adjoint, gradient);
  return value;
}

/* ---------- data and one evaluation ---------- */

typedef struct {
  size_t n;
  double mean;
  double *time, *errors, *value;
} data_t;

static void read_data(const char *path, data_t *data) {
  FILE *file = fopen(path, "rb");
  if (!file) die("cannot open data file", path);
  char magic[8];
  uint64_t n;
  if (fread(magic, 1, 8, file) != 8 || memcmp(magic, "HORODAT1", 8) != 0) die("not a benchmark data file", path);
  if (fread(&n, 8, 1, file) != 1 || fread(&data->mean, 8, 1, file) != 1) die("truncated data file", path);
  data->n = (size_t)n;
  double **columns[3] = {&data->time, &data->errors, &data->value};
  for (int c = 0; c < 3; c++) {
    *columns[c] = malloc(sizeof(double) * (data->n ? data->n : 1));
    if (!*columns[c]) die("out of memory", NULL);
    if (fread(*columns[c], sizeof(double), data->n, file) != data->n) die("truncated data file", path);
  }
  fclose(file);
}

/*
 * Build the kernel from its parameters, check and prepare the inputs, run the recursion: the work of
 * `new GaussianProcess(kernel, t, { errors, mean }).logLikelihood(y)` in TypeScript, which copies the times
 * and forms errors^2 in one checking pass, lets the recursion subtract the mean, and checks the values only
 * when the result is not finite.
 */
static double evaluate(const term_t *terms, int term_count, const data_t *data) {
  form_t form;
  build_form(&form, terms, term_count);
  size_t n = data->n;
  double *time = malloc(sizeof(double) * n);
  double *noise = malloc(sizeof(double) * n);
  if (!time || !noise) die("out of memory", NULL);
  for (size_t i = 0; i < n; i++) {
    double t = data->time[i], e = data->errors[i];
    if (!isfinite(t)) die("time is not finite", NULL);
    if (i > 0 && t < time[i - 1]) die("times must be sorted", NULL);
    if (!isfinite(e) || e < 0) die("error must be finite and >= 0", NULL);
    time[i] = t;
    noise[i] = e * e;
  }
  double result = recursion(&form, n, time, noise, data->value, data->mean);
  /* The values are checked only when the result is not finite (a value that is not finite makes it so), as
     the TypeScript evaluateWithDeferredValueCheck does: no separate pass over them. */
  if (!isfinite(result))
    for (size_t i = 0; i < n; i++)
      if (!isfinite(data->value[i])) die("value is not finite", NULL);
  free(time);
  free(noise);
  return result;
}

static double clock_seconds(clockid_t clock) {
  struct timespec ts;
  clock_gettime(clock, &ts);
  return (double)ts.tv_sec + 1e-9 * (double)ts.tv_nsec;
}

/* Wall-clock seconds. */
static double now_seconds(void) { return clock_seconds(CLOCK_MONOTONIC); }

/* CPU seconds used by this process (on a shared machine, waiting for a core is not counted). */
static double cpu_seconds(void) { return clock_seconds(CLOCK_PROCESS_CPUTIME_ID); }

static int compare_doubles(const void *a, const void *b) {
  double x = *(const double *)a, y = *(const double *)b;
  return (x > y) - (x < y);
}

int main(int argc, char **argv) {
  int serve = 0;
  long repeat = 1, rounds = 7;
  int arg = 1;
  for (; arg < argc && strncmp(argv[arg], "--", 2) == 0; arg++) {
    if (strcmp(argv[arg], "--serve") == 0) serve = 1;
    else if (strcmp(argv[arg], "--repeat") == 0 && arg + 1 < argc) repeat = atol(argv[++arg]);
    else if (strcmp(argv[arg], "--rounds") == 0 && arg + 1 < argc) rounds = atol(argv[++arg]);
    else die("unknown option", argv[arg]);
  }
  if (argc - arg < 2 || repeat < 1 || rounds < 1) {
    fprintf(stderr, "usage: engine-loglike [--serve | --repeat K --rounds M] DATAFILE TERM [TERM ...]\n");
    return 2;
  }
  init_series();
  init_gradient_series();
  data_t data;
  read_data(argv[arg++], &data);
  int term_count = argc - arg;
  if (term_count > MAX_BLOCKS) die("too many kernel terms", NULL);
  term_t terms[MAX_BLOCKS];
  for (int i = 0; i < term_count; i++) parse_term(argv[arg + i], &terms[i]);

  if (serve) {
    /* Prepared inputs for "core" requests. */
    form_t form;
    build_form(&form, terms, term_count);
    double *noise = malloc(sizeof(double) * (data.n ? data.n : 1));
    double *residual = malloc(sizeof(double) * (data.n ? data.n : 1));
    if (!noise || !residual) die("out of memory", NULL);
    for (size_t i = 0; i < data.n; i++) {
      noise[i] = data.errors[i] * data.errors[i];
      residual[i] = data.value[i] - data.mean;
    }
    char line[64];
    double gradient[MAX_PARAMETERS];
    while (fgets(line, sizeof line, stdin)) {
      int core = strncmp(line, "core ", 5) == 0;
      int with_gradient = strncmp(line, "gradient ", 9) == 0;
      if (!core && !with_gradient && strncmp(line, "full ", 5) != 0) break;
      long k = atol(line + (with_gradient ? 9 : 5));
      if (k < 1) break;
      double value = 0;
      double start = now_seconds();
      double cpu_start = cpu_seconds();
      if (with_gradient)
        for (long i = 0; i < k; i++) value = gradient_recursion(&form, data.n, data.time, noise, residual, 0, gradient);
      else if (core)
        for (long i = 0; i < k; i++) value = recursion(&form, data.n, data.time, noise, residual, 0);
      else
        for (long i = 0; i < k; i++) value = evaluate(terms, term_count, &data);
      double cpu = cpu_seconds() - cpu_start;
      double seconds = now_seconds() - start;
      printf("%.17g %.9e %.9e", value, seconds, cpu);
      if (with_gradient)
        for (int c = 0; c < form.parameter_count; c++) printf(" %.17g", gradient[c]);
      printf("\n");
      fflush(stdout);
    }
    return 0;
  }

  double *wall = malloc(sizeof(double) * (size_t)rounds);
  double *cpu = malloc(sizeof(double) * (size_t)rounds);
  if (!wall || !cpu) die("out of memory", NULL);
  double value = evaluate(terms, term_count, &data); /* warm-up */
  double points = (double)repeat * (double)data.n;
  for (long round = 0; round < rounds; round++) {
    double start = now_seconds();
    double cpu_start = cpu_seconds();
    for (long i = 0; i < repeat; i++) value = evaluate(terms, term_count, &data);
    cpu[round] = 1e9 * (cpu_seconds() - cpu_start) / points;
    wall[round] = 1e9 * (now_seconds() - start) / points;
  }
  qsort(wall, (size_t)rounds, sizeof(double), compare_doubles);
  qsort(cpu, (size_t)rounds, sizeof(double), compare_doubles);
  printf("logL %.17g\nns/point %.3f (CPU time) %.3f (wall clock), median of %ld rounds\n", value, cpu[rounds / 2],
         wall[rounds / 2], rounds);
  free(wall);
  free(cpu);
  return 0;
}

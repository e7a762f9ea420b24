/*
 * C reference for the implicit viscous-transport step: the assembly of the θ-scheme rows in the j-flux form
 * and the Thomas solve, written to mirror worker/kernels/disk/viscous-transport.ts and tridiagonal.ts line
 * for line, with the same arithmetic in the same order. The grid and the input state are built exactly as
 * test/bench/implicit-step-case.ts builds them, so both sides solve the same system. Only exp and log come
 * from different libraries (the C library here, V8's own in JS) and may differ in the last bit, so inputs and
 * results agree to ~1e-13 rather than bit for bit; fed bit-identical inputs, the two give identical bits.
 *
 * Usage:
 *   implicit-step N REPS [BATCHES]   time BATCHES batches of REPS steps on N cells; print one JSON line
 *                                    with the ns per cell per step of every batch
 *   implicit-step --check N CASE     solve one step of case "timed" or "branches"; print the boundary flows,
 *                                    the checksum Σ_i Σ'_i A_i (the disk mass after the step) and every Σ'_i
 *
 * Compile with -ffp-contract=off so no multiply-add is fused: JavaScript rounds every operation separately.
 */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>

#ifndef M_PI
#define M_PI 3.14159265358979323846
#endif

static const double AU_CGS = 1.495978707e13;
static const double YEAR_CGS = 365.25 * 86400;

typedef struct {
  int n;
  double *edges, *centers, *area, *sqrt_centers, *sqrt_edges, *edge_weight;
} grid_t;

typedef struct {
  double *lower, *diag, *upper, *rhs, *scratch;
} workspace_t;

typedef struct {
  double mdot_inner, mdot_outer;
} flows_t;

/* An edge is either zero torque (has_flow = 0) or carries a prescribed inward mass flow, g s^-1. */
typedef struct {
  int has_flow;
  double flow;
} edge_t;

static double *alloc(int n) {
  double *p = calloc((size_t)n, sizeof(double));
  if (p == NULL) {
    fprintf(stderr, "out of memory\n");
    exit(1);
  }
  return p;
}

/* grid.ts: makeLogGrid */
static grid_t make_log_grid(double r_in, double r_out, int n) {
  grid_t g = {n, alloc(n + 1), alloc(n), alloc(n), alloc(n), alloc(n + 1), alloc(n + 1)};
  const double log_in = log(r_in);
  const double dlog = (log(r_out) - log_in) / n;
  for (int e = 0; e <= n; e++) g.edges[e] = exp(log_in + e * dlog);
  g.edges[0] = r_in;
  g.edges[n] = r_out;
  for (int i = 0; i < n; i++) {
    g.centers[i] = sqrt(g.edges[i] * g.edges[i + 1]);
    g.area[i] = M_PI * (g.edges[i + 1] * g.edges[i + 1] - g.edges[i] * g.edges[i]);
    g.sqrt_centers[i] = sqrt(g.centers[i]);
  }
  for (int e = 0; e <= n; e++) g.sqrt_edges[e] = sqrt(g.edges[e]);
  g.edge_weight[0] = 1 / (g.sqrt_centers[0] - g.sqrt_edges[0]);
  for (int e = 1; e < n; e++) g.edge_weight[e] = 1 / (g.sqrt_centers[e] - g.sqrt_centers[e - 1]);
  g.edge_weight[n] = 1 / (g.sqrt_edges[n] - g.sqrt_centers[n - 1]);
  return g;
}

/* tridiagonal.ts: solveTridiagonal */
static void solve_tridiagonal(const double *lower, const double *diag, const double *upper, const double *rhs,
                              double *out, double *scratch, int n) {
  double inv = 1 / diag[0];
  out[0] = rhs[0] * inv;
  for (int i = 1; i < n; i++) {
    scratch[i] = upper[i - 1] * inv;
    inv = 1 / (diag[i] - lower[i] * scratch[i]);
    out[i] = (rhs[i] - lower[i] * out[i - 1]) * inv;
  }
  for (int i = n - 2; i >= 0; i--) out[i] -= scratch[i + 1] * out[i + 1];
}

/* viscous-transport.ts: viscousStep. noinline keeps the timed loop calling it like the JS does. */
__attribute__((noinline)) static flows_t viscous_step(const grid_t *grid, const double *sigma, const double *nu_explicit,
                                                      const double *nu_implicit, const double *mass_source, double dt,
                                                      double theta, edge_t inner, edge_t outer, workspace_t *ws,
                                                      double *sigma_out) {
  const int n = grid->n;
  const double *area = grid->area, *sqrt_centers = grid->sqrt_centers, *w = grid->edge_weight;
  double *lower = ws->lower, *diag = ws->diag, *upper = ws->upper, *rhs = ws->rhs, *scratch = ws->scratch;
  const double three_pi = 3 * M_PI;
  const double implicit = theta * dt * three_pi;
  const double explicit = (1 - theta) * dt * three_pi;
  const double w_in = !inner.has_flow ? w[0] : 0;
  const double w_out = !outer.has_flow ? w[n] : 0;

  double x_prev = 0;
  double flow_inner = 0;
  for (int i = 0; i < n; i++) {
    const double x = nu_explicit[i] * sigma[i] * sqrt_centers[i];
    const double below = i == 0 ? w_in * x : w[i] * (x - x_prev);
    if (i == 0) flow_inner = below;
    rhs[i] = below;
    x_prev = x;
  }
  const double explicit_outer = -w_out * x_prev;

  double c_prev = 0;
  double c_cur = nu_implicit[0] * sqrt_centers[0];
  double w_below = w_in;
  double flow_below = rhs[0];
  for (int i = 0; i < n; i++) {
    const int last = i == n - 1;
    const double c_next = last ? 0 : nu_implicit[i + 1] * sqrt_centers[i + 1];
    const double w_above = last ? w_out : w[i + 1];
    const double flow_above = last ? explicit_outer : rhs[i + 1];
    lower[i] = -implicit * w_below * c_prev;
    upper[i] = -implicit * w_above * c_next;
    diag[i] = area[i] + implicit * (w_below + w_above) * c_cur;
    double b = area[i] * sigma[i] + explicit * (flow_above - flow_below);
    if (mass_source != NULL) b += dt * mass_source[i];
    if (i == 0 && inner.has_flow) b -= dt * inner.flow;
    if (last && outer.has_flow) b += dt * outer.flow;
    rhs[i] = b;
    c_prev = c_cur;
    c_cur = c_next;
    w_below = w_above;
    flow_below = flow_above;
  }
  solve_tridiagonal(lower, diag, upper, rhs, sigma_out, scratch, n);

  flows_t f;
  f.mdot_inner = inner.has_flow ? inner.flow
                                : three_pi * (w_in * theta * nu_implicit[0] * sigma_out[0] * sqrt_centers[0] +
                                              (1 - theta) * flow_inner);
  const double x_out_new = nu_implicit[n - 1] * sigma_out[n - 1] * sqrt_centers[n - 1];
  f.mdot_outer = outer.has_flow ? -outer.flow : three_pi * (w_out * theta * x_out_new - (1 - theta) * explicit_outer);
  return f;
}

/* The bench input; implicit-step-case.ts holds the same definitions. */
typedef struct {
  grid_t grid;
  double *sigma, *nu, *source;
  double dt, theta;
  edge_t inner, outer;
} bench_case_t;

static bench_case_t make_case(int n, int branches) {
  bench_case_t c;
  c.grid = make_log_grid(0.05 * AU_CGS, 1000 * AU_CGS, n);
  c.sigma = alloc(n);
  c.nu = alloc(n);
  c.source = NULL;
  for (int i = 0; i < n; i++) {
    const double x = c.grid.centers[i] / (30 * AU_CGS);
    c.sigma[i] = 1000 * exp(-x) / x;
    c.nu[i] = 1e15 * (c.grid.centers[i] / AU_CGS);
  }
  c.dt = 1000 * YEAR_CGS;
  c.theta = 1;
  c.inner = (edge_t){0, 0};
  c.outer = (edge_t){0, 0};
  if (branches) {
    c.theta = 0.5;
    c.source = alloc(n);
    for (int i = 0; i < n; i++) c.source[i] = 1e18 * exp(-c.grid.centers[i] / (10 * AU_CGS));
    c.inner = (edge_t){1, 1e18};
    c.outer = (edge_t){1, -1e16};
  }
  return c;
}

static workspace_t make_workspace(int n) {
  return (workspace_t){alloc(n), alloc(n), alloc(n), alloc(n), alloc(n)};
}

static double now_ns(void) {
  struct timespec ts;
  clock_gettime(CLOCK_MONOTONIC, &ts);
  return (double)ts.tv_sec * 1e9 + (double)ts.tv_nsec;
}

static int check(int n, const char *which) {
  const int branches = strcmp(which, "branches") == 0;
  if (!branches && strcmp(which, "timed") != 0) {
    fprintf(stderr, "unknown case %s (expected timed or branches)\n", which);
    return 2;
  }
  bench_case_t c = make_case(n, branches);
  workspace_t ws = make_workspace(n);
  double *out = alloc(n);
  const flows_t f = viscous_step(&c.grid, c.sigma, c.nu, c.nu, c.source, c.dt, c.theta, c.inner, c.outer, &ws, out);
  double checksum = 0;
  for (int i = 0; i < n; i++) checksum += out[i] * c.grid.area[i];
  printf("flows %.17g %.17g\n", f.mdot_inner, f.mdot_outer);
  printf("checksum %.17g\n", checksum);
  for (int i = 0; i < n; i++) printf("%.17g\n", out[i]);
  return 0;
}

static int timed(int n, long reps, int batches) {
  bench_case_t c = make_case(n, 0);
  workspace_t ws = make_workspace(n);
  double *out = alloc(n);
  double *per_cell = alloc(batches);
  /* dt is read through a volatile each step, so no step can be hoisted out of the loop as invariant. */
  volatile double dt_source = c.dt;
  double sink = 0;
  const int warmup = batches / 10 + 1;
  for (int b = -warmup; b < batches; b++) {
    const double t0 = now_ns();
    for (long k = 0; k < reps; k++) {
      const flows_t f = viscous_step(&c.grid, c.sigma, c.nu, c.nu, NULL, dt_source, c.theta, c.inner, c.outer, &ws, out);
      sink += out[k % n] + f.mdot_inner;
    }
    const double t1 = now_ns();
    if (b >= 0) per_cell[b] = (t1 - t0) / ((double)reps * n);
  }
  printf("{\"n\":%d,\"reps\":%ld,\"sink\":%.17g,\"ns_per_cell_step\":[", n, reps, sink);
  for (int b = 0; b < batches; b++) printf(b == 0 ? "%.6g" : ",%.6g", per_cell[b]);
  printf("]}\n");
  return 0;
}

int main(int argc, char **argv) {
  if (argc == 4 && strcmp(argv[1], "--check") == 0) return check(atoi(argv[2]), argv[3]);
  if (argc == 3 || argc == 4) {
    const int n = atoi(argv[1]);
    const long reps = atol(argv[2]);
    const int batches = argc == 4 ? atoi(argv[3]) : 101;
    if (n >= 2 && reps >= 1 && batches >= 1) return timed(n, reps, batches);
  }
  fprintf(stderr, "usage: %s N REPS [BATCHES] | %s --check N timed|branches\n", argv[0], argv[0]);
  return 2;
}

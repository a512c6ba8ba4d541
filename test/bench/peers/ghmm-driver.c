/*
 * Benchmark driver for the GHMM C library (Debian libghmm-dev), written for underfoot's benchmark
 * (bench/peers.ts compiles it at run time with gcc and feeds it on stdin). Not part of the product.
 *
 * Reads one discrete HMM and its runs from stdin, as whitespace-separated numbers:
 *
 *   N M                      states, symbols (the last symbol is the dropout: emission 1 in every state)
 *   pi_0 ... pi_{N-1}        start probabilities
 *   for each state i:  k  j_1 a_1 ... j_k a_k       its k successors with their probabilities
 *   for each state i:  b_i0 ... b_i(M-1)            its emission row
 *   R                        number of runs
 *   for each run:      T  o_0 ... o_{T-1}            its symbols
 *   C  K_1 ... K_C           Baum-Welch calls to time, with their iteration counts
 *
 * and prints one line per operation: `score <seconds> <sum of log P>` (ghmm_dmodel_forward_lean over
 * every run), `viterbi <seconds> <sum of path log P>` (ghmm_dmodel_viterbi), `baum-welch <K> <seconds>`
 * for each call of ghmm_dmodel_baum_welch_nstep with K steps (each call continues from the model the
 * previous one left, and runs one more forward pass at its end — so the cost of one iteration is the
 * difference of two calls divided by the difference of their K), then `rss-kb <peak resident set>`.
 * Seconds are CLOCK_MONOTONIC around the library calls only.
 *
 * Usage notes from DEVELOPERS.md, "Reference libraries and peers": edge counts are set by hand (ghmm_dmodel_calloc does not),
 * in- and out-lists are filled consistently, and the three ATLAS LAPACK symbols that this Debian build
 * of libghmm.so.1 references without depending on ATLAS are defined here as aborting stubs (only
 * continuous-emission code reaches them). Run with MALLOC_MMAP_THRESHOLD_=33554432
 * MALLOC_TRIM_THRESHOLD_=4294967296 so that per-step temporary allocations do not churn page faults.
 */
#include <stdio.h>
#include <stdlib.h>
#include <time.h>
#include <sys/resource.h>
#include <ghmm/ghmm.h>
#include <ghmm/model.h>
#include <ghmm/foba.h>
#include <ghmm/viterbi.h>
#include <ghmm/reestimate.h>
#include <ghmm/sequence.h>

int clapack_dgetrf(void) { fprintf(stderr, "ghmm-driver: clapack_dgetrf reached\n"); abort(); }
int clapack_dgetri(void) { fprintf(stderr, "ghmm-driver: clapack_dgetri reached\n"); abort(); }
int clapack_dpotrf(void) { fprintf(stderr, "ghmm-driver: clapack_dpotrf reached\n"); abort(); }

static void fail(const char *what) {
  fprintf(stderr, "ghmm-driver: %s\n", what);
  exit(1);
}

static int read_int(void) {
  int v;
  if (scanf("%d", &v) != 1) fail("input must be whitespace-separated numbers, got a short or bad read");
  return v;
}

static double read_double(void) {
  double v;
  if (scanf("%lf", &v) != 1) fail("input must be whitespace-separated numbers, got a short or bad read");
  return v;
}

static double now(void) {
  struct timespec ts;
  clock_gettime(CLOCK_MONOTONIC, &ts);
  return ts.tv_sec + ts.tv_nsec * 1e-9;
}

int main(void) {
  int N = read_int();
  int M = read_int();
  double *pi = malloc(sizeof(double) * N);
  for (int i = 0; i < N; i++) pi[i] = read_double();
  int *outDeg = calloc(N, sizeof(int));
  int *inDeg = calloc(N, sizeof(int));
  int **succ = malloc(sizeof(int *) * N);
  double **prob = malloc(sizeof(double *) * N);
  for (int i = 0; i < N; i++) {
    outDeg[i] = read_int();
    succ[i] = malloc(sizeof(int) * outDeg[i]);
    prob[i] = malloc(sizeof(double) * outDeg[i]);
    for (int k = 0; k < outDeg[i]; k++) {
      succ[i][k] = read_int();
      prob[i][k] = read_double();
      if (succ[i][k] < 0 || succ[i][k] >= N) fail("successor must be a state index");
      inDeg[succ[i][k]]++;
    }
  }
  ghmm_dmodel *mo = ghmm_dmodel_calloc(M, N, GHMM_kDiscreteHMM, inDeg, outDeg);
  if (!mo) fail("ghmm_dmodel_calloc failed");
  for (int i = 0; i < N; i++) {
    mo->s[i].pi = pi[i];
    mo->s[i].out_states = outDeg[i];
    mo->s[i].in_states = 0;
    for (int r = 0; r < M; r++) mo->s[i].b[r] = read_double();
  }
  for (int i = 0; i < N; i++) {
    for (int k = 0; k < outDeg[i]; k++) {
      int j = succ[i][k];
      mo->s[i].out_id[k] = j;
      mo->s[i].out_a[k] = prob[i][k];
      int q = mo->s[j].in_states++;
      mo->s[j].in_id[q] = i;
      mo->s[j].in_a[q] = prob[i][k];
    }
  }
  int R = read_int();
  ghmm_dseq *sq = ghmm_dseq_calloc(R);
  if (!sq) fail("ghmm_dseq_calloc failed");
  for (int r = 0; r < R; r++) {
    int T = read_int();
    sq->seq[r] = malloc(sizeof(int) * (T > 0 ? T : 1));
    sq->seq_len[r] = T;
    sq->seq_w[r] = 1.0;
    for (int t = 0; t < T; t++) sq->seq[r][t] = read_int();
  }
  sq->total_w = R;
  int nCalls = read_int();
  int *calls = malloc(sizeof(int) * (nCalls > 0 ? nCalls : 1));
  for (int c = 0; c < nCalls; c++) calls[c] = read_int();

  double t0 = now();
  double total = 0;
  for (int r = 0; r < R; r++) {
    double logp;
    if (ghmm_dmodel_forward_lean(mo, sq->seq[r], sq->seq_len[r], &logp) != 0) fail("ghmm_dmodel_forward_lean failed");
    total += logp;
  }
  printf("score %.9f %.17g\n", now() - t0, total);
  fflush(stdout);

  t0 = now();
  double paths = 0;
  for (int r = 0; r < R; r++) {
    int len;
    double logp;
    int *path = ghmm_dmodel_viterbi(mo, sq->seq[r], sq->seq_len[r], &len, &logp);
    if (!path) fail("ghmm_dmodel_viterbi failed");
    paths += logp;
    free(path);
  }
  printf("viterbi %.9f %.17g\n", now() - t0, paths);
  fflush(stdout);

  for (int c = 0; c < nCalls; c++) {
    t0 = now();
    if (ghmm_dmodel_baum_welch_nstep(mo, sq, calls[c], 0.0) != 0) fail("ghmm_dmodel_baum_welch_nstep failed");
    printf("baum-welch %d %.9f\n", calls[c], now() - t0);
    fflush(stdout);
  }
  struct rusage ru;
  getrusage(RUSAGE_SELF, &ru);
  printf("rss-kb %ld\n", ru.ru_maxrss);
  return 0;
}

#!/usr/bin/env Rscript
# Golden p-values for package test from R base (stats).
#
# Writes testdata/test_r.tsv. Rows (tab-separated):
#   binom    k n p0 alternative pvalue cp_lo cp_hi          binom.test (two-sided: point probability, tolerance 1e-7)
#   score1   k n p0 alternative correct pvalue lo hi        prop.test, one sample (score test, Wilson interval)
#   fisher   k1 n1 k2 n2 alternative pvalue                 fisher.test on matrix(c(k1, n1-k1, k2, n2-k2), 2)
#   score2   k1 n1 k2 n2 alternative correct statistic pvalue   prop.test, two samples (Pearson chi-square)
#   mcnemar  n12 n21 correct statistic pvalue               mcnemar.test
# Rows whose p-value is below 1e-300 are left out.
#
# Run from the repository root:  Rscript testdata/gen/test_r.R
options(scipen = 100)
alts <- c("two.sided", "less", "greater")
altname <- function(a) if (a == "two.sided") "two-sided" else a
num <- function(x) trimws(formatC(x, digits = 17, format = "g"))
out <- c("# Golden p-values for package test from R base (see the row layout in the generator).",
         "# Generator: Rscript testdata/gen/test_r.R",
         paste0("# Tool: ", R.version.string),
         paste0("# Date: ", format(Sys.Date())))
add <- function(...) out <<- c(out, paste(..., sep = "\t"))

for (n in c(1, 2, 4, 7, 12, 25, 40, 81, 150, 263, 999, 5000, 100000)) {
  for (p0 in c(0.5, 0.2, 0.05, 0.9, 0.37, 0.003)) {
    ks <- unique(pmin(n, pmax(0, round(c(0, 1, n / 4, n / 2, n * p0, n * p0 + 2 * sqrt(n * p0 * (1 - p0)), n - 1, n)))))
    for (k in ks) for (a in alts) {
      r <- binom.test(k, n, p0, alternative = a)
      if (r$p.value >= 1e-300)
        add("binom", k, n, num(p0), altname(a), num(r$p.value), num(r$conf.int[1]), num(r$conf.int[2]))
      for (cc in c(FALSE, TRUE)) {
        r <- suppressWarnings(prop.test(k, n, p0, alternative = a, correct = cc))
        if (r$p.value >= 1e-300)
          add("score1", k, n, num(p0), altname(a), cc, num(r$p.value), num(r$conf.int[1]), num(r$conf.int[2]))
      }
    }
  }
}
sizes <- list(c(3, 3), c(4, 6), c(8, 8), c(10, 25), c(20, 20), c(33, 41), c(100, 80), c(500, 700))
for (sz in sizes) {
  n1 <- sz[1]; n2 <- sz[2]
  for (k1 in unique(round(seq(0, n1, length.out = 6)))) for (k2 in unique(round(seq(0, n2, length.out = 6)))) {
    for (a in alts) {
      r <- fisher.test(matrix(c(k1, n1 - k1, k2, n2 - k2), 2), alternative = a)
      if (r$p.value >= 1e-300) add("fisher", k1, n1, k2, n2, altname(a), num(r$p.value))
      s <- k1 + k2
      if (s > 0 && s < n1 + n2) for (cc in c(FALSE, TRUE)) {
        r <- suppressWarnings(prop.test(c(k1, k2), c(n1, n2), alternative = a, correct = cc))
        if (r$p.value >= 1e-300) add("score2", k1, n1, k2, n2, altname(a), cc, num(r$statistic), num(r$p.value))
      }
    }
  }
}
for (b in c(0, 1, 2, 5, 9, 20, 60)) for (c in c(1, 3, 7, 15, 40, 100)) for (cc in c(FALSE, TRUE)) {
  if (b == c) next
  r <- mcnemar.test(matrix(c(10, c, b, 10), 2), correct = cc)
  add("mcnemar", b, c, cc, num(r$statistic), num(r$p.value))
}
writeLines(out, "testdata/test_r.tsv")

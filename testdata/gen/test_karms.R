#!/usr/bin/env Rscript
# Golden values for the multiplicity adjustments and the k-sample tests of
# package test, from R base (stats).
#
# Writes testdata/test_karms_r.tsv. Rows (tab-separated; lists are comma-separated):
#   adjust   method  p-values  adjusted        p.adjust(p, method) for holm, hochberg, hommel,
#                                              bonferroni, BH, BY
#   chisq    successes  sizes  X2  p           chisq.test(rbind(x, n - x), correct = FALSE)
#   gtest    successes  sizes  G2  p           the likelihood-ratio statistic 2 sum O log(O/E)
#                                              computed here, p from pchisq(lower.tail = FALSE)
#   exact    successes  sizes  p               fisher.test(rbind(x, n - x)) (network algorithm,
#                                              Freeman-Halton ordering by table probability)
#   gof      counts  shares  X2  p             chisq.test(counts, p = shares)
#   pairs    successes  sizes  method  adjusted   pairwise.prop.test(x, n, p.adjust.method = method,
#                                              correct = FALSE), pairs (1,2), (1,3), ..., (2,3), ...
# Run from the repository root:  Rscript testdata/gen/test_karms.R   (a few seconds)
options(scipen = 100)
num <- function(x) paste(trimws(formatC(x, digits = 17, format = "g")), collapse = ",")
out <- c("# Golden values for multiplicity adjustments and k-sample tests from R base (layout in the generator).",
         "# Generator: Rscript testdata/gen/test_karms.R",
         paste0("# Tool: ", R.version.string),
         paste0("# Date: ", format(Sys.Date())))
add <- function(...) out <<- c(out, paste(..., sep = "\t"))

set.seed(20261203)
vecs <- list(
  c(0.01, 0.02, 0.03, 0.04, 0.05),
  c(0.04, 0.04, 0.04, 0.04),
  c(0, 1, 0.5, 0, 1),
  c(0.001),
  c(1),
  c(0.012, 0.3, 0.012, 0.9, 0.044, 0.044, 0.0001, 0.6, 0.6, 0.05),
  runif(25)^3,
  round(runif(40), 2),
  c(runif(30) * 0.01, runif(30)),
  sort(runif(200)^4),
  runif(1000)^2,
  c(0.0001, 0.0004, 0.0019, 0.0095, 0.0201, 0.0278, 0.0298, 0.0344, 0.0459, 0.3240, 0.4262, 0.5719,
    0.6528, 0.7590, 1.000)  # Benjamini and Hochberg (1995), section 4.2
)
for (p in vecs) for (m in c("holm", "hochberg", "hommel", "bonferroni", "BH", "BY"))
  add("adjust", m, num(p), num(p.adjust(p, m)))

tables <- list(
  list(x = c(5, 9, 12), n = c(20, 20, 20)),
  list(x = c(0, 3, 1, 4), n = c(6, 7, 5, 8)),
  list(x = c(2, 2), n = c(10, 3)),
  list(x = c(1, 4, 0), n = c(3, 5, 2)),
  list(x = c(30, 41, 25, 52, 38), n = c(100, 110, 95, 120, 105)),
  list(x = c(7, 1, 3, 5, 2, 6), n = c(12, 9, 11, 10, 8, 13)),
  list(x = c(12, 20, 8), n = c(200, 210, 190)),
  list(x = c(40, 62, 55), n = c(300, 310, 290)),
  list(x = c(3, 0, 0, 1), n = c(4, 4, 4, 4))
)
for (tb in tables) {
  x <- tb$x; n <- tb$n; m <- rbind(x, n - x)
  cs <- suppressWarnings(chisq.test(m, correct = FALSE))
  add("chisq", num(x), num(n), num(unname(cs$statistic)), num(cs$p.value))
  E <- outer(rowSums(m), colSums(m)) / sum(m)
  g <- 2 * sum(ifelse(m > 0, m * log(m / E), 0))
  add("gtest", num(x), num(n), num(g), num(pchisq(g, length(x) - 1, lower.tail = FALSE)))
  add("exact", num(x), num(n), num(fisher.test(m, workspace = 2e8)$p.value))
}

gofs <- list(
  list(x = c(5023, 4977), s = c(0.5, 0.5)),
  list(x = c(10210, 9790), s = c(0.5, 0.5)),
  list(x = c(3310, 3390, 3300), s = c(1, 1, 1) / 3),
  list(x = c(812, 1190), s = c(0.4, 0.6)),
  list(x = c(7, 3, 10), s = c(0.25, 0.25, 0.5))
)
for (g in gofs) {
  cs <- suppressWarnings(chisq.test(g$x, p = g$s))
  add("gof", num(g$x), num(g$s), num(unname(cs$statistic)), num(cs$p.value))
}
for (tb in tables[c(1, 5, 7, 8)]) for (m in c("holm", "hommel", "BH")) {
  pv <- suppressWarnings(pairwise.prop.test(tb$x, tb$n, p.adjust.method = m, correct = FALSE)$p.value)
  k <- length(tb$x); v <- c()
  for (i in 1:(k - 1)) for (j in (i + 1):k) v <- c(v, pv[j - 1, i])
  add("pairs", num(tb$x), num(tb$n), m, num(v))
}
writeLines(out, "testdata/test_karms_r.tsv")

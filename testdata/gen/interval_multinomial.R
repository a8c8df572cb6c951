#!/usr/bin/env Rscript
# Golden values for the simultaneous multinomial intervals of package interval, from R base.
#
# Writes testdata/interval_multinomial_r.tsv. Rows (tab-separated; lists comma-separated):
#   qh       counts level lower upper    Quesenberry-Hurst (1964) limits with qchisq(level, k - 1)
#   goodman  counts level lower upper    Goodman (1965) limits with qchisq(1 - (1 - level)/k, 1)
#   sg       counts level c gamma        Sison-Glaz (1995): c and gamma from Levin's (1981) formula with
#                                        ppois/dpois and the Edgeworth expansion, written out here
#   box      counts c nu                 the exact multinomial probability at p = counts/N that every
#                                        count lies within c of its own: N!/(N^N e^-N) times the
#                                        probability that independent Poisson(n_i) truncated to the
#                                        box sum to N, by convolution (exact, no expansion)
# Run from the repository root:  Rscript testdata/gen/interval_multinomial.R   (about a second)
options(scipen = 100)
num <- function(x) paste(trimws(formatC(x, digits = 17, format = "g")), collapse = ",")
out <- c("# Golden values for simultaneous multinomial intervals from R base (layout in the generator).",
         "# Generator: Rscript testdata/gen/interval_multinomial.R",
         paste0("# Tool: ", R.version.string),
         paste0("# Date: ", format(Sys.Date())))
add <- function(...) out <<- c(out, paste(..., sep = "\t"))

chisqLimits <- function(x, A) {
  N <- sum(x); h <- sqrt(A * (A + 4 * x * (N - x) / N))
  list(lo = pmax(0, (A + 2 * x - h) / (2 * (N + A))), hi = pmin(1, (A + 2 * x + h) / (2 * (N + A))))
}
nuLevin <- function(x, c) {
  N <- sum(x); lv <- lfactorial(N) - N * log(N) + N
  mu <- 0; v <- 0; m3 <- 0; m4 <- 0
  for (ni in x[x > 0]) {
    a <- max(ni - c, 0); b <- min(ni + c, N); y <- a:b
    pr <- dpois(y, ni); s <- sum(pr); w <- pr / s
    m <- sum(w * y); d <- y - m
    c2 <- sum(w * d^2); c3 <- sum(w * d^3); c4 <- sum(w * d^4)
    lv <- lv + log(ppois(b, ni) - ppois(a - 1, ni))
    mu <- mu + m; v <- v + c2; m3 <- m3 + c3; m4 <- m4 + c4 - 3 * c2^2
  }
  if (v == 0) return(exp(lv))
  g1 <- m3 / v^1.5; g2 <- m4 / v^2; z <- (N - mu) / sqrt(v)
  fe <- dnorm(z) * (1 + g1 / 6 * (z^3 - 3 * z) + g2 / 24 * (z^4 - 6 * z^2 + 3) +
                    g1^2 / 72 * (z^6 - 15 * z^4 + 45 * z^2 - 15))
  min(1, max(0, exp(lv) * fe / sqrt(v)))
}
sg <- function(x, level) {
  c <- 0
  while (nuLevin(x, c + 1) < level) c <- c + 1
  if (nuLevin(x, c) >= level) return(c(0, 0))
  c(c, (level - nuLevin(x, c)) / (nuLevin(x, c + 1) - nuLevin(x, c)))
}
box <- function(x, c) {
  N <- sum(x); p <- x / N; poly <- c(1, rep(0, N))  # coefficients of z^0..z^N
  for (i in seq_along(x)) {
    a <- max(x[i] - c, 0); b <- min(x[i] + c, N)
    term <- rep(0, N + 1); y <- a:b
    term[y + 1] <- dpois(y, x[i]); if (x[i] == 0) term <- c(1, rep(0, N))
    new <- rep(0, N + 1)
    for (j in which(term > 0)) new[j:(N + 1)] <- new[j:(N + 1)] + term[j] * poly[1:(N + 2 - j)]
    poly <- new
  }
  exp(lfactorial(N) - N * log(N) + N) * poly[N + 1]
}

sets <- list(c(56, 72, 73, 59, 62, 87, 58), c(1, 0, 3, 12, 0, 4), c(20, 30, 50), c(5, 0, 0, 1, 2, 0, 0, 0, 3, 1),
             c(400, 300, 200, 100), c(2, 3))
for (x in sets) for (level in c(0.9, 0.95, 0.99)) {
  k <- length(x)
  q <- chisqLimits(x, qchisq(level, k - 1))
  add("qh", num(x), num(level), num(q$lo), num(q$hi))
  g <- chisqLimits(x, qchisq(1 - (1 - level) / k, 1))
  add("goodman", num(x), num(level), num(g$lo), num(g$hi))
  s <- sg(x, level)
  add("sg", num(x), num(level), num(s[1]), num(s[2]))
}
for (x in sets[c(1, 2, 3, 4, 6)]) for (c in c(1, 3, 6, 10)) add("box", num(x), c, num(box(x, c)))
writeLines(out, "testdata/interval_multinomial_r.tsv")

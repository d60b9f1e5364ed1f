# Reference fixture for changepoint segmentation: the annual flow of the Nile at
# Aswan, 1871-1970 (R datasets::Nile, 10^8 m^3), with a documented level shift
# around 1898-1899 (Cobb 1978, Biometrika 65:243-251; the first Aswan dam).
# Writes fixtures/breaks_nile.json with the data, the R version and two base-R
# reference computations on the same data:
#  - exhaustive single change in mean by least squares (every split point);
#  - optimal partitioning (Jackson et al. 2005) of the Gaussian change-in-mean cost
#    RSS / sigma^2 with sigma = mad(diff(y)) / sqrt(2) and penalties 2 log n (BIC, p = 2)
#    and 3 log n (MBIC), an O(n^2) dynamic programme written here in base R.
# No JSON package is available: JSON is written with sprintf("%.17g").
y <- as.numeric(datasets::Nile)
years <- as.numeric(time(datasets::Nile))
n <- length(y)

# single change: first index (0-based) of the second segment minimising total RSS
rss <- function(v) sum((v - mean(v))^2)
single <- sapply(1:(n - 1), function(k) rss(y[1:k]) + rss(y[(k + 1):n]))
k1 <- which.min(single)        # last point of the first segment (1-based)

sigma <- mad(diff(y)) / sqrt(2) # R's mad: 1.4826 * median absolute deviation
op <- function(beta) {
  z <- y / sigma
  cs <- c(0, cumsum(z)); cs2 <- c(0, cumsum(z^2))
  cost <- function(s, t) { m <- t - s; a <- cs[t + 1] - cs[s + 1]; max(0, cs2[t + 1] - cs2[s + 1] - a^2 / m) }
  F <- c(-beta, rep(Inf, n)); last <- integer(n + 1)
  for (t in 1:n) {
    best <- Inf
    for (s in 0:(t - 1)) { v <- F[s + 1] + cost(s, t) + beta; if (v < best) { best <- v; last[t + 1] <- s } }
    F[t + 1] <- best
  }
  ch <- integer(0); t <- n
  while (t > 0) { s <- last[t + 1]; if (s > 0) ch <- c(s, ch); t <- s }
  list(changes = ch, penalised = F[n + 1])
}
bic <- op(2 * log(n))
mbic <- op(3 * log(n))

num <- function(v) paste(sprintf("%.17g", v), collapse = ", ")
out <- file.path("fixtures", "breaks_nile.json")
cat(sprintf('{
  "source": "R datasets::Nile (annual flow of the Nile at Aswan, 10^8 m^3, 1871-1970); level shift around 1898-1899 documented by Cobb (1978), Biometrika 65:243-251",
  "generator": "test/reference/gen_breaks.R",
  "rVersion": "%s",
  "n": %d,
  "years": [%s],
  "flow": [%s],
  "singleChange": { "method": "exhaustive least squares over every split, base R", "firstIndexOfSecondSegment": %d, "year": %s, "rss": %s },
  "sigma": { "method": "mad(diff(y)) / sqrt(2), R stats::mad (constant 1.4826)", "value": %s },
  "optimalPartitioning": {
    "method": "optimal partitioning of RSS / sigma^2, base R O(n^2) dynamic programme; changes are 0-based first indices of new segments",
    "bic": { "penalty": %s, "changes": [%s], "penalisedCost": %s },
    "mbic": { "penalty": %s, "changes": [%s], "penalisedCost": %s }
  }
}
', R.version.string, n, num(years), num(y), k1, num(years[k1 + 1]), num(single[k1]), num(sigma),
   num(2 * log(n)), paste(bic$changes, collapse = ", "), num(bic$penalised),
   num(3 * log(n)), paste(mbic$changes, collapse = ", "), num(mbic$penalised)), file = out)
cat("wrote", out, "\n")

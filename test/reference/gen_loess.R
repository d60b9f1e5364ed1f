# Reference fixtures for LOESS / LOWESS (Debian r-base-core: stats::lowess, stats::loess).
#
# Writes fixtures/loess_r.json. Data: R's datasets::cars (speed, dist; 50 rows, sorted by
# speed, with tied speeds) and a seeded series made here (set.seed(7); n = 500;
# x = sort(runif(n, 0, 10)) rounded to 2 decimals, so with ties; y = sin(x) + x / 5 + rnorm(n, sd = 0.3)
# with 10 gross outliers added at rows 25, 75, ..., 475).
# Cases:
#   lowess(x, y, f, iter, delta)                 (Cleveland's LOWESS: local linear, tricube,
#                                                 bisquare robustness; delta interpolation)
#   loess(y ~ x, span, degree, family, surface = "direct")
#                                                (exact local fit at every x, no kd-tree
#                                                 interpolation; family "gaussian" = no
#                                                 robustness, "symmetric" = 4 fits with
#                                                 bisquare weights between them; trace.hat
#                                                 exact)
# R has no JSON package here, so JSON is written by hand with 17 significant digits.
# Run with Rscript --vanilla (see generate.sh).

num <- function(v) paste0("[", paste(sprintf("%.17g", v), collapse = ", "), "]")
str <- function(s) paste0("\"", s, "\"")
obj <- function(...) {
  a <- list(...)
  paste0("{", paste(sprintf("\"%s\": %s", names(a), unlist(a)), collapse = ", "), "}")
}

set.seed(7)
n <- 500
sx <- round(sort(runif(n, 0, 10)), 2)
sy <- sin(sx) + sx / 5 + rnorm(n, sd = 0.3)
out_rows <- seq(25, 475, by = 50)
sy[out_rows] <- sy[out_rows] + 4

datasets <- list(cars = list(x = cars$speed, y = cars$dist), seeded = list(x = sx, y = sy))

cases <- character(0)
for (dn in names(datasets)) {
  d <- datasets[[dn]]
  x <- d$x; y <- d$y
  rng <- diff(range(x))
  for (s in list(list(f = 2/3, iter = 3L, delta = 0.01 * rng), list(f = 0.3, iter = 0L, delta = 0),
                 list(f = 0.3, iter = 3L, delta = 0), list(f = 0.25, iter = 3L, delta = 0.05 * rng))) {
    fit <- lowess(x, y, f = s$f, iter = s$iter, delta = s$delta)
    cases <- c(cases, obj(data = str(dn), fn = str("lowess"), f = sprintf("%.17g", s$f), iter = s$iter,
                          delta = sprintf("%.17g", s$delta), fitted = num(fit$y)))
  }
  for (s in list(list(span = 0.5, degree = 1L, family = "gaussian"), list(span = 0.75, degree = 2L, family = "gaussian"),
                 list(span = 0.3, degree = 2L, family = "gaussian"), list(span = 0.75, degree = 2L, family = "symmetric"),
                 list(span = 0.4, degree = 1L, family = "symmetric"))) {
    fit <- loess(y ~ x, span = s$span, degree = s$degree, family = s$family,
                 control = loess.control(surface = "direct", statistics = "exact", trace.hat = "exact"))
    cases <- c(cases, obj(data = str(dn), fn = str("loess"), span = sprintf("%.17g", s$span), degree = s$degree,
                          family = str(s$family), iterations = if (s$family == "gaussian") 1L else 4L,
                          trace_hat = sprintf("%.17g", fit$trace.hat), fitted = num(fitted(fit))))
  }
}

data_json <- paste0("{", paste(sprintf("\"%s\": {\"x\": %s, \"y\": %s}", names(datasets),
  sapply(datasets, function(d) num(d$x)), sapply(datasets, function(d) num(d$y))), collapse = ", "), "}")
json <- paste0("{\"source\": \"R stats::lowess and stats::loess (surface = direct) on datasets::cars and a seeded series\", ",
               "\"versions\": {\"R\": ", str(R.version.string), "}, ",
               "\"parameters\": {\"seed\": 7, \"n_seeded\": ", n, ", \"loess_control\": \"surface = direct, statistics = exact, trace.hat = exact\"}, ",
               "\"data\": ", data_json, ", \"cases\": [", paste(cases, collapse = ", "), "]}")
args <- commandArgs(trailingOnly = FALSE)
here <- dirname(sub("^--file=", "", args[grep("^--file=", args)]))
writeLines(json, file.path(here, "fixtures", "loess_r.json"))

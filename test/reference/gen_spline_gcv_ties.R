# Reference: the GCV choice of R's smooth.spline on data with tied x, where the
# criterion belongs to the original observations (RSS including the scatter
# within each tie group, N the number of observations), not to the merged points.
# Writes fixtures/spline_gcv_ties.json. JSON is written by hand (no JSON package here).
# R's penalty routine uses the rounded constant 0.3330 for 1/3 (see shared notes),
# so its df agrees with the exact spline's only to about 1e-2 at the GCV optimum.
suppressMessages(library(MASS))
num <- function(v) paste0("[", paste(format(v, digits = 17), collapse = ", "), "]")
case <- function(name, source, x, y) {
  f <- smooth.spline(x, y, all.knots = TRUE, control.spar = list(tol = 1e-12, eps = 1e-15, maxit = 2000))
  sprintf('{"name": "%s", "source": "%s", "x": %s, "y": %s, "df": %s, "lambda_R": %s, "cv_crit": %s, "n_obs": %d, "n_distinct": %d}',
          name, source, num(x), num(y), format(f$df, digits = 17), format(f$lambda, digits = 17),
          format(f$cv.crit, digits = 17), length(x), length(unique(x)))
}
cases <- c(
  case("mcycle", paste("R MASS::mcycle", R.version.string), mcycle$times, mcycle$accel),
  case("cars", paste("R datasets::cars", R.version.string), cars$speed, cars$dist)
)
out <- paste0('{"generator": "test/reference/gen_spline_gcv_ties.R", "r_version": "', R.version.string,
              '", "function": "smooth.spline(x, y, all.knots = TRUE, control.spar = list(tol = 1e-12, eps = 1e-15, maxit = 2000)) with its default GCV", "cases": [',
              paste(cases, collapse = ", "), ']}')
dir.create("fixtures", showWarnings = FALSE)
writeLines(out, "fixtures/spline_gcv_ties.json")  # run from test/reference, as generate.sh does

# Reference values for STL (Cleveland, Cleveland, McRae & Terpenning 1990) from R's stats::stl
# on R's datasets co2 (monthly, 1959-1997) and nottem (monthly, 1920-1939), several settings
# including robust and periodic. Writes fixtures/stl_r.json (JSON written by hand: no JSON package).
# Parameters are recorded under our option names; the values R resolves (odd windows, jumps) too.
num <- function(v) paste0("[", paste(sprintf("%.17g", v), collapse = ","), "]")
cases <- list(
  list(name = "co2-s7", data = "co2", args = list(s.window = 7)),
  list(name = "co2-s35-deg1-robust", data = "co2", args = list(s.window = 35, s.degree = 1, robust = TRUE)),
  list(name = "nottem-periodic", data = "nottem", args = list(s.window = "periodic")),
  list(name = "nottem-s7-robust-t21-jump1", data = "nottem", args = list(s.window = 7, t.window = 21, robust = TRUE, s.jump = 1, t.jump = 1, l.jump = 1)),
  list(name = "nottem-s13-deg1-t0-l13-inner3-outer2", data = "nottem", args = list(s.window = 13, s.degree = 1, t.degree = 0, l.window = 13, inner = 3, outer = 2))
)
out <- character(0)
for (cs in cases) {
  x <- get(cs$data, envir = as.environment("package:datasets"))
  f <- do.call(stl, c(list(x = x), cs$args))
  a <- cs$args
  d <- f$deg; w <- f$win; j <- f$jump
  params <- sprintf('{"period":%d,"seasonalWindow":%s,"seasonalDegree":%d,"trendWindow":%d,"trendDegree":%d,"lowPassWindow":%d,"lowPassDegree":%d,"seasonalJump":%d,"trendJump":%d,"lowPassJump":%d,"innerLoops":%d,"outerLoops":%d}',
    frequency(x), if (identical(a$s.window, "periodic")) '"periodic"' else as.character(w[["s"]]), d[["s"]], w[["t"]], d[["t"]], w[["l"]], d[["l"]], j[["s"]], j[["t"]], j[["l"]], f$inner, f$outer)
  out <- c(out, sprintf('{"name":"%s","dataset":"R datasets::%s","call":"%s","options":%s,"y":%s,"seasonal":%s,"trend":%s,"remainder":%s,"weights":%s}',
    cs$name, cs$data, gsub('"', "'", deparse(as.call(c(as.name("stl"), list(x = as.name(cs$data)), cs$args)), width.cutoff = 500L)), params,
    num(as.numeric(x)), num(f$time.series[, "seasonal"]), num(f$time.series[, "trend"]), num(f$time.series[, "remainder"]), num(f$weights)))
}
json <- sprintf('{"source":"R stats::stl","version":"%s","note":"R defaults: seasonal degree 0, jumps ceiling(window/10), inner 2 (robust: 1) and outer 0 (robust: 15); periodic: s.window = 10 n + 1, degree 0, season averaged per phase","cases":[%s]}',
  R.version.string, paste(out, collapse = ","))
dir.create("fixtures", showWarnings = FALSE)
writeLines(json, "fixtures/stl_r.json")

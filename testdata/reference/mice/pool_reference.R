# Reference values for Rubin's rules with the Barnard-Rubin (1999) degrees
# of freedom, from Debian's r-cran-mice (apt-get install -y r-cran-mice).
# Run from this directory:
#
#     Rscript pool_reference.R > pool_reference.json
#
# Each case gives the m completed-data estimates q, their variances u and
# the complete-data df, and mice's pooled estimate, SE, df and p. Cases:
# fixed inputs (m = 5, small and large dfcom), inputs drawn with a fixed
# seed (m = 20), and the coefficients of lm(chl ~ bmi + age) on mice's
# bundled nhanes data imputed by mice itself (m = 5, seed 1).
suppressPackageStartupMessages(library(mice))

num <- function(x) paste(formatC(x, digits = 17, format = "g"), collapse = ", ")

emit <- function(name, q, u, dfcom, last) {
  p <- pool.scalar(q, u, n = dfcom + 1, k = 1)
  p.value <- 2 * pt(abs(p$qbar) / sqrt(p$t), p$df, lower.tail = FALSE)
  cat(sprintf('  {"name": "%s", "q": [%s], "u": [%s], "dfcom": %s,\n   "estimate": %s, "std_error": %s, "df": %s, "p_value": %s}%s\n',
              name, num(q), num(u), num(dfcom), num(p$qbar), num(sqrt(p$t)), num(p$df), num(p.value),
              if (last) "" else ","))
}

cat(sprintf('{"source": "R %s, mice %s", "cases": [\n', getRversion(), packageVersion("mice")))
emit("fixed, dfcom 100", c(0.52, 0.49, 0.55, 0.50, 0.47), c(0.0021, 0.0019, 0.0024, 0.0020, 0.0022), 100, FALSE)
emit("fixed, dfcom 12", c(1.9, 2.6, 2.2, 1.4, 2.9), c(0.40, 0.52, 0.35, 0.47, 0.44), 12, FALSE)
set.seed(20261202)
emit("drawn, m 20", rnorm(20, 0.2, 0.05), rchisq(20, 30) / 30 * 0.006, 150, FALSE)

imp <- mice(nhanes, m = 5, seed = 1, print = FALSE)
fits <- with(imp, lm(chl ~ bmi + age))$analyses
for (term in c("bmi", "age")) {
  q <- sapply(fits, function(f) coef(f)[[term]])
  u <- sapply(fits, function(f) vcov(f)[term, term])
  emit(paste("nhanes lm(chl ~ bmi + age),", term), q, u, fits[[1]]$df.residual, term == "age")
}
cat("]}\n")

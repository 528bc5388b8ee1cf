# Reference standard errors of regression coefficients by full-information
# maximum likelihood under missing data, from the R SEM reference (Debian's
# R SEM package, r-cran-l...): missing = "ml", observed information
# (se = "standard", information = "observed"), fixed.x = FALSE, each model
# saturated (df 0), so its ML estimates are the saturated normal model's
# (EM's) mean and covariance and its coefficients' SEs are the delta method
# on the saturated model's observed information.
# Run from this directory:
#
#     Rscript ml_se.R > ml_se.json
#
# Cases: (a) R's mtcars (datasets package), mpg ~ wt + hp with mpg set
# missing where hp > 180 (7 of 32 rows), so only the outcome is missing;
# the data are written to mtcars_outcome.csv. (b) R's airquality (the
# CSV in ../airquality), all six columns: Ozone ~ Solar.R + Wind + Temp,
# with Month and Day free to covary with everything (auxiliaries), so the
# model is the saturated one of all six. Partial correlations are
# defined parameters (the residual correlation of two outcomes regressed
# on the same predictors), whose SEs are the same delta method.
suppressPackageStartupMessages(library(lavaan))
reference <- .packages()[1] # the package just attached

num <- function(x) formatC(x, digits = 17, format = "g")

# saturated writes the model's remaining covariances: every pair of vars.
saturated <- function(vars) {
  out <- character(0)
  for (i in seq_along(vars)) for (j in i:length(vars)) out <- c(out, paste(vars[i], "~~", vars[j]))
  out
}

fitted <- function(lines, data) {
  fit <- sem(paste(lines, collapse = "\n"), data = data, missing = "ml", fixed.x = FALSE,
             se = "standard", information = "observed")
  stopifnot(fitMeasures(fit, "df") == 0)
  fit
}

cases <- character(0)
emit <- function(name, data, outcome, focal, adjust, scale, est, se) {
  cases <<- c(cases, sprintf(
    '  {"name": "%s", "data": "%s", "outcome": "%s", "focal": "%s", "adjust": [%s], "scale": "%s",\n   "estimate": %s, "std_error": %s}',
    name, data, outcome, focal, paste0('"', adjust, '"', collapse = ", "), scale, num(est), num(se)))
}

regressions <- function(name, file, fit, outcome, preds) {
  pe <- parameterEstimates(fit)
  ss <- standardizedSolution(fit)
  for (x in preds) {
    i <- which(pe$lhs == outcome & pe$op == "~" & pe$rhs == x)
    j <- which(ss$lhs == outcome & ss$op == "~" & ss$rhs == x)
    adj <- setdiff(preds, x)
    emit(name, file, outcome, x, adj, "unstandardized", pe$est[i], pe$se[i])
    emit(name, file, outcome, x, adj, "standardized", ss$est.std[j], ss$se[j])
  }
}

partial <- function(name, file, fit, a, b, given) {
  pe <- parameterEstimates(fit)
  i <- which(pe$lhs == "r" & pe$op == ":=")
  emit(name, file, b, a, given, "correlation", pe$est[i], pe$se[i])
}

# (a) only the outcome missing.
mt <- mtcars[, c("mpg", "wt", "hp")]
mt$mpg[mt$hp > 180] <- NA
write.csv(mt, "mtcars_outcome.csv", row.names = FALSE, na = "")
fit <- fitted(c("mpg ~ wt + hp", saturated(c("wt", "hp"))), mt)
regressions("mtcars, mpg missing where hp > 180", "mtcars_outcome.csv", fit, "mpg", c("wt", "hp"))
fit <- fitted(c("mpg ~ hp", "wt ~ hp", "mpg ~~ c*wt", "mpg ~~ vy*mpg", "wt ~~ vx*wt", "hp ~~ hp",
                "r := c / sqrt(vy * vx)"), mt)
partial("mtcars, mpg missing where hp > 180", "mtcars_outcome.csv", fit, "wt", "mpg", "hp")

# (b) airquality, six columns, Month and Day auxiliaries.
aq <- read.csv("../airquality/airquality.csv")
names(aq) <- c("ozone", "solar_r", "wind", "temp", "month", "day")
preds <- c("solar_r", "wind", "temp")
fit <- fitted(c("ozone ~ solar_r + wind + temp", "month ~~ ozone", "day ~~ ozone",
                saturated(c(preds, "month", "day"))), aq)
regressions("airquality, six columns", "../airquality/airquality.csv", fit, "ozone", preds)
fit <- fitted(c("ozone ~ wind + temp", "solar_r ~ wind + temp", "ozone ~~ c*solar_r",
                "ozone ~~ vy*ozone", "solar_r ~~ vx*solar_r",
                "month + day ~~ ozone + solar_r", saturated(c("wind", "temp", "month", "day")),
                "r := c / sqrt(vy * vx)"), aq)
partial("airquality, six columns", "../airquality/airquality.csv", fit, "solar_r", "ozone", c("wind", "temp"))

cat(sprintf('{"source": "R %s, the R SEM reference %s: missing = \\"ml\\", observed information", "cases": [\n',
            getRversion(), packageVersion(reference)))
cat(paste(cases, collapse = ",\n"), "\n]}\n", sep = "")

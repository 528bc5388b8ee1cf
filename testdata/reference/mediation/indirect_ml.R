# Reference indirect effects under missing data by full-information
# maximum likelihood, from the R SEM reference (Debian's R SEM package,
# r-cran-l...): missing = "ml", fixed.x = FALSE, observed information
# (se = "standard", information = "observed"), every model saturated in
# its variables (df 0), so that its estimates are functions of the
# saturated normal model's (EM's) mean and covariance and their SEs the
# delta method on that model's observed information, which is what
# pathvet's maximum-likelihood re-estimate of an indirect claim computes.
# The model fit's optimizer stops short of the maximum (with the default
# EM tolerance of its starting values, by up to 5e-6 of the estimates;
# with em.h1.tol = 1e-12, as here, by about 1e-7), so each effect is also
# computed, as est_h1, from the reference's own EM estimate of the
# saturated model's covariance (sampstat.h1, EM to 1e-12), the
# coefficients by least squares from it.
# Run from this directory:
#
#     Rscript indirect_ml.R > indirect_ml.json
#
# Data: R's bundled mtcars (datasets package), hp and disp divided by 100
# as in indirect.R, with wt set missing where qsec > 19 (5 rows) and mpg
# where hp > 2.3 (6 rows); written to mtcars_missing.csv. Numerical
# references only, not claims about cars.
#   single: wt ~ a*disp + am, mpg ~ b*wt + disp + am, ab := a*b
#   serial: wt ~ a1*hp, qsec ~ a2*hp + d*wt, mpg ~ b1*wt + b2*qsec + hp
suppressPackageStartupMessages(library(lavaan))
pkg <- .packages()[1] # the package just attached

d <- mtcars[, c("mpg", "disp", "hp", "wt", "qsec", "am")]
d$hp <- d$hp / 100
d$disp <- d$disp / 100
d$wt[d$qsec > 19] <- NA
d$mpg[d$hp > 2.3] <- NA
write.csv(d, "mtcars_missing.csv", row.names = FALSE, na = "")

# coef is the least-squares coefficient of x when y is regressed on xs,
# from the covariance matrix S.
coef <- function(S, y, xs, x) unname(solve(S[xs, xs, drop = FALSE], S[xs, y])[which(xs == x)])

models <- list(
  single = list(vars = c("disp", "am", "wt", "mpg"), from = "disp", to = "mpg",
    h1 = function(S) {
      a <- coef(S, "wt", c("disp", "am"), "disp"); b <- coef(S, "mpg", c("wt", "disp", "am"), "wt")
      c(ab = a * b)
    }, syntax = '
    wt ~ a*disp + am
    mpg ~ b*wt + disp + am
    disp ~~ am
    ab := a*b'),
  serial = list(vars = c("hp", "wt", "qsec", "mpg"), from = "hp", to = "mpg",
    h1 = function(S) {
      a1 <- coef(S, "wt", "hp", "hp")
      a2 <- coef(S, "qsec", c("hp", "wt"), "hp"); d <- coef(S, "qsec", c("hp", "wt"), "wt")
      b1 <- coef(S, "mpg", c("wt", "qsec", "hp"), "wt"); b2 <- coef(S, "mpg", c("wt", "qsec", "hp"), "qsec")
      c(ind_wt = a1 * b1, ind_serial = a1 * d * b2, through_wt = a1 * b1 + a1 * d * b2,
        total_ind = a1 * b1 + a2 * b2 + a1 * d * b2)
    }, syntax = '
    wt ~ a1*hp
    qsec ~ a2*hp + d*wt
    mpg ~ b1*wt + b2*qsec + hp
    ind_wt := a1*b1
    ind_serial := a1*d*b2
    through_wt := a1*b1 + a1*d*b2
    total_ind := a1*b1 + a2*b2 + a1*d*b2'))

num <- function(x) formatC(x, digits = 17, format = "g")

emit <- function(name, m, last) {
  fit <- sem(m$syntax, data = d[, m$vars], missing = "ml", fixed.x = FALSE,
             se = "standard", information = "observed", em.h1.tol = 1e-12, em.h1.iter.max = 100000)
  stopifnot(fitMeasures(fit, "df") == 0)
  pe <- parameterEstimates(fit)
  ss <- standardizedSolution(fit)
  defs <- pe[pe$op == ":=", ]
  S <- lavInspect(fit, "sampstat.h1")$cov
  h1 <- m$h1(S)
  ratio <- sqrt(S[m$from, m$from] / S[m$to, m$to])
  cat(sprintf('  {"name": "%s", "n": %d, "defined": [\n', name, nobs(fit)))
  for (k in seq_len(nrow(defs))) {
    l <- defs$label[k]
    j <- which(ss$op == ":=" & ss$lhs == l)
    cat(sprintf('    {"label": "%s", "rhs": "%s", "est": %s, "se": %s, "est_std_all": %s, "se_std_all": %s,\n',
                l, defs$rhs[k], num(defs$est[k]), num(defs$se[k]), num(ss$est.std[j]), num(ss$se[j])))
    cat(sprintf('     "est_h1": %s, "est_std_h1": %s}%s\n', num(h1[[l]]), num(h1[[l]] * ratio),
                if (k == nrow(defs)) "" else ","))
  }
  cat(sprintf('  ]}%s\n', if (last) "" else ","))
}

cat(sprintf('{"source": "R %s, Debian\'s R SEM package %s", "data": "mtcars_missing.csv", "models": [\n',
            getRversion(), packageVersion(pkg)))
for (k in seq_along(models)) emit(names(models)[k], models[[k]], k == length(models))
cat("]}\n")

# Reference values for indirect effects, from the R SEM reference
# (Debian's R structural-equation package, installed with R here). Run
# from this directory:
#
#     Rscript indirect.R > indirect.json
#
# Data: R's bundled mtcars (datasets package; Henderson & Velleman 1981,
# from Motor Trend 1974), 32 cars, with hp and disp divided by 100 so that
# the variances are of like size; the rows used are written to mtcars.csv.
# The models are numerical references only, not claims about cars.
#
# Three models, each fitted by maximum likelihood with the exogenous
# variables fixed (the package's defaults: divisor N, expected
# information), indirect effects as defined parameters (x := products of
# labelled coefficients) with their delta-method standard errors, the
# completely standardized estimates, and a percentile bootstrap of 2,000
# resamples (seed 18) with its draws:
#   single: wt ~ disp + am, mpg ~ wt + disp + am (one mediator, a covariate)
#   serial: wt ~ hp, qsec ~ hp + wt, mpg ~ wt + qsec + hp (two mediators, in series and in parallel)
#   parallel: wt ~ disp, hp ~ disp, mpg ~ wt + hp (two mediators, no direct arrow; not saturated)
suppressPackageStartupMessages(library(lavaan))

d <- mtcars[, c("mpg", "disp", "hp", "wt", "qsec", "am")]
d$hp <- d$hp / 100
d$disp <- d$disp / 100
write.csv(d, "mtcars.csv", row.names = FALSE)

models <- list(
  single = '
    wt ~ a*disp + am
    mpg ~ b*wt + c*disp + am
    ab := a*b
    total := c + a*b',
  serial = '
    wt ~ a1*hp
    qsec ~ a2*hp + d*wt
    mpg ~ b1*wt + b2*qsec + c*hp
    ind_wt := a1*b1
    ind_qsec := a2*b2
    ind_serial := a1*d*b2
    through_wt := a1*b1 + a1*d*b2
    through_qsec := a2*b2 + a1*d*b2
    total_ind := a1*b1 + a2*b2 + a1*d*b2',
  parallel = '
    wt ~ a1*disp
    hp ~ a2*disp
    mpg ~ b1*wt + b2*hp
    ind_wt := a1*b1
    ind_hp := a2*b2
    total_ind := a1*b1 + a2*b2')

num <- function(x) paste(ifelse(is.finite(x), formatC(x, digits = 17, format = "g"), "null"), collapse = ", ")
pkg <- .packages()[1] # the package just attached

emit_model <- function(name, syntax, last) {
  fit <- sem(syntax, data = d)
  pe <- parameterEstimates(fit)
  pt <- parTable(fit)
  V <- vcov(fit)
  reg <- pe[pe$op == "~", ]
  cat(sprintf('  {"name": "%s", "n": %d, "equations": [\n', name, nobs(fit)))
  ys <- unique(reg$lhs)
  for (k in seq_along(ys)) {
    rows <- reg[reg$lhs == ys[k], ]
    idx <- pt$free[pt$op == "~" & pt$lhs == ys[k]]
    cat(sprintf('    {"y": "%s", "x": [%s], "est": [%s], "se": [%s], "vcov": [%s], "resid_var": %s}%s\n',
                ys[k], paste0('"', rows$rhs, '"', collapse = ", "), num(rows$est), num(rows$se),
                num(as.vector(V[idx, idx])), num(pe$est[pe$op == "~~" & pe$lhs == ys[k] & pe$rhs == ys[k]]),
                if (k == length(ys)) "" else ","))
  }
  off <- 0
  for (a in ys) for (b in ys) if (a != b) {
    off <- max(off, abs(V[pt$free[pt$op == "~" & pt$lhs == a], pt$free[pt$op == "~" & pt$lhs == b]]))
  }
  std <- standardizedSolution(fit)
  set.seed(18)
  bfit <- sem(syntax, data = d, se = "bootstrap", bootstrap = 2000)
  bpe <- parameterEstimates(bfit, boot.ci.type = "perc", level = 0.95)
  BOOT <- inspect(bfit, "boot")
  draws <- t(apply(BOOT, 1, bfit@Model@def.function))
  defs <- pe[pe$op == ":=", ]
  cat(sprintf('    ], "largest_cross_equation_cov": %s, "boot_resamples": %d, "defined": [\n', num(off), nrow(BOOT)))
  for (k in seq_len(nrow(defs))) {
    l <- defs$label[k]
    cat(sprintf('    {"label": "%s", "rhs": "%s", "est": %s, "se": %s, "est_std_all": %s,\n',
                l, defs$rhs[k], num(defs$est[k]), num(defs$se[k]), num(std$est.std[std$op == ":=" & std$lhs == l])))
    cat(sprintf('     "boot_lo": %s, "boot_hi": %s, "boot_se": %s,\n     "boot_draws": [%s]}%s\n',
                num(bpe$ci.lower[bpe$label == l]), num(bpe$ci.upper[bpe$label == l]), num(bpe$se[bpe$label == l]),
                num(draws[, l]), if (k == nrow(defs)) "" else ","))
  }
  cat(sprintf('  ]}%s\n', if (last) "" else ","))
}

cat(sprintf('{"source": "R %s, Debian\'s R SEM package %s", "data": "mtcars (R datasets), hp and disp / 100", "models": [\n',
            getRversion(), packageVersion(pkg)))
for (k in seq_along(models)) emit_model(names(models)[k], models[[k]], k == length(models))
cat("]}\n")

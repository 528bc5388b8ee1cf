# Reference values for checks/latent from the R SEM reference (Debian's R
# SEM package: install r-cran- followed by the name in the library() call
# below, the only place it is named). Run from this directory:
#
#     Rscript make_reference.R
#
# It writes the data it fitted (hs.csv: Holzinger & Swineford 1939, the
# Grant-White and Pasteur schools, 301 pupils, x1..x9 and age in years;
# poldem.csv: Bollen 1989, Structural Equations with Latent Variables,
# industrialization and political democracy, 75 countries), both bundled
# with the R package, and reference.json: for each model and for both
# likelihood conventions ("wishart": S with divisor N - 1 and
# T = (N - 1) F_ML; "normal": S with divisor N and T = N F_ML) the fit
# measures, every parameter's estimate and SE (from the expected and,
# as se_observed, from the observed information),
# the standardized solution (all variables standardized; residual
# covariances as residual correlations) and the defined effects with
# delta-method SEs.
suppressPackageStartupMessages(library(lavaan))
suppressPackageStartupMessages(library(jsonlite))

hs <- HolzingerSwineford1939[, c(paste0("x", 1:9), "ageyr")]
write.csv(hs, "hs.csv", row.names = FALSE)
write.csv(PoliticalDemocracy, "poldem.csv", row.names = FALSE)
hs <- read.csv("hs.csv")
poldem <- read.csv("poldem.csv")

models <- list(
  hs_cfa = list(data = hs, syntax = "
    visual  =~ x1 + x2 + x3
    textual =~ x4 + x5 + x6
    speed   =~ x7 + x8 + x9"),
  hs_structural = list(data = hs, syntax = "
    visual  =~ x1 + x2 + x3
    textual =~ x4 + x5 + x6
    speed   =~ x7 + x8 + x9
    textual ~ a*visual + g*ageyr
    speed   ~ b*textual + c*visual
    visual ~~ ageyr
    ind := a*b
    tot := c + a*b
    age_speed := g*b"),
  # An observed variable as the outcome of two latents.
  hs_observed_outcome = list(data = hs, syntax = "
    visual  =~ x1 + x2 + x3
    textual =~ x4 + x5 + x6
    ageyr ~ visual + textual"),
  poldem = list(data = poldem, syntax = "
    ind60 =~ x1 + x2 + x3
    dem60 =~ y1 + y2 + y3 + y4
    dem65 =~ y5 + y6 + y7 + y8
    dem60 ~ a*ind60
    dem65 ~ c*ind60 + b*dem60
    y1 ~~ y5
    y2 ~~ y4 + y6
    y3 ~~ y7
    y4 ~~ y8
    y6 ~~ y8
    ind := a*b
    tot := c + a*b"),
  # A Markov-equivalent structural graph of poldem (the three constructs'
  # complete DAG in the reverse order): the same chi-square.
  poldem_reversed = list(data = poldem, syntax = "
    ind60 =~ x1 + x2 + x3
    dem60 =~ y1 + y2 + y3 + y4
    dem65 =~ y5 + y6 + y7 + y8
    dem60 ~ dem65
    ind60 ~ dem60 + dem65
    y1 ~~ y5
    y2 ~~ y4 + y6
    y3 ~~ y7
    y4 ~~ y8
    y6 ~~ y8")
)

measures <- c("npar", "chisq", "df", "pvalue", "cfi", "tli", "rmsea", "rmsea.ci.lower",
              "rmsea.ci.upper", "srmr", "baseline.chisq", "baseline.df")

one <- function(m, likelihood) {
  fit <- sem(m$syntax, data = m$data, likelihood = likelihood, information = "expected",
             se = "standard", fixed.x = FALSE)
  observed <- sem(m$syntax, data = m$data, likelihood = likelihood, information = "observed",
                  se = "standard", fixed.x = FALSE)
  pe <- parameterEstimates(fit)
  std <- standardizedSolution(fit)
  list(
    converged = lavInspect(fit, "converged"),
    n = nobs(fit),
    fit = as.list(fitMeasures(fit, measures)),
    params = data.frame(lhs = pe$lhs, op = pe$op, rhs = pe$rhs, est = pe$est, se = pe$se,
                        se_observed = parameterEstimates(observed)$se, std_all = std$est.std)
  )
}

out <- list(source = sprintf("R %s, R SEM reference %s", getRversion(), getNamespaceVersion(environment(sem))),
            models = list())
for (name in names(models)) {
  out$models[[name]] <- list(
    data = if (identical(models[[name]]$data, hs)) "hs.csv" else "poldem.csv",
    wishart = one(models[[name]], "wishart"),
    normal = one(models[[name]], "normal"))
}
writeLines(toJSON(out, auto_unbox = TRUE, digits = NA, pretty = TRUE), "reference.json")

# The percentile bootstrap of an indirect effect in the R SEM reference
# (Debian's R structural-equation package), for testdata/bench/mediation.sh.
#
#   Rscript mediation.R write rows.csv   # 10,000 rows of the benchmark's model
#   Rscript mediation.R time rows.csv    # seconds for 2,000 bootstrap resamples
#
# The model is that of BenchmarkBootstrap10kx10 (checks/mediation): seven
# covariates c1..c7, exposure x, mediator m, outcome y; the bootstrap
# refits the mediator's and the outcome's equations, as pathvet's does.
args <- commandArgs(trailingOnly = TRUE)
if (args[1] == "write") {
  set.seed(18)
  n <- 10000
  d <- as.data.frame(matrix(rnorm(n * 7), n, 7, dimnames = list(NULL, paste0("c", 1:7))))
  cs <- as.matrix(d)
  w <- 0.3 / (1:7)
  d$x <- drop(cs %*% w) + rnorm(n)
  d$m <- 0.3 * d$x + drop(cs %*% (0.3 / (2:8))) + rnorm(n)
  d$y <- 0.3 * d$m + 0.15 * d$x + drop(cs %*% (0.3 / (3:9))) + rnorm(n)
  write.csv(d, args[2], row.names = FALSE)
  quit(status = 0)
}
suppressPackageStartupMessages(library(lavaan))
d <- read.csv(args[2])
model <- '
  m ~ a*x + c1 + c2 + c3 + c4 + c5 + c6 + c7
  y ~ b*m + x + c1 + c2 + c3 + c4 + c5 + c6 + c7
  ab := a*b'
set.seed(1)
elapsed <- system.time(fit <- sem(model, data = d, se = "bootstrap", bootstrap = 2000))[["elapsed"]]
pe <- parameterEstimates(fit, boot.ci.type = "perc")
ab <- pe[pe$label == "ab", ]
cat(sprintf("%.6g %.6g %.6g\n", elapsed, ab$ci.lower, ab$ci.upper))

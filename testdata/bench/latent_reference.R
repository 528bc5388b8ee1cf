# The R SEM reference's side of testdata/bench/latent.sh (Debian's R SEM
# package: r-cran- followed by the name in the library() call, the only
# place it is named). With "write DIR" it simulates the 10-construct x 4-item data set
# (N = 500, seed 19) into DIR/big.csv; with "time DIR" it times, per fit,
# what checks/latent's benchmarks time: the fit from the sample
# covariance (estimates, expected-information SEs, chi-square) and the fit
# measures (CFI, TLI, RMSEA with its interval, SRMR), for
#   hs_cfa      the Holzinger & Swineford (1939) three-factor CFA,
#   big         the 10 x 4 model with its declared structural DAG,
#   class24     the 24 members of that DAG's Markov equivalence class (the
#               orders of the complete DAG over L0..L3), each refitted
#               starting from the declared fit; seconds for all 24.
# It prints "name seconds" lines.
suppressPackageStartupMessages(library(lavaan))
args <- commandArgs(trailingOnly = TRUE)
dir <- args[2]

structure <- function(order) {
  arcs <- c()
  for (j in 2:4) arcs <- c(arcs, sprintf("L%d ~ %s", order[j], paste0("L", order[1:(j - 1)], collapse = " + ")))
  c(arcs, "L5 ~ L3 + L4", "L6 ~ L5", "L7 ~ L6", "L8 ~ L7", "L9 ~ L8")
}
measurement <- sprintf("L%d =~ %s", 0:9, sapply(0:9, function(j) paste0("y", 4 * j + 1:4, collapse = " + ")))
syntax <- function(order) paste(c(measurement, structure(order)), collapse = "\n")

if (args[1] == "write") {
  set.seed(19)
  n <- 500
  eta <- matrix(0, n, 10)
  b <- function() runif(1, 0.3, 0.6)
  eta[, 1] <- rnorm(n)
  eta[, 2] <- b() * eta[, 1] + rnorm(n)
  eta[, 3] <- b() * eta[, 1] + b() * eta[, 2] + rnorm(n)
  eta[, 4] <- b() * eta[, 1] + b() * eta[, 2] + b() * eta[, 3] + rnorm(n)
  eta[, 5] <- rnorm(n)
  eta[, 6] <- b() * eta[, 4] + b() * eta[, 5] + rnorm(n)
  for (j in 7:10) eta[, j] <- b() * eta[, j - 1] + rnorm(n)
  y <- sapply(1:40, function(i) runif(1, 0.6, 1.0) * eta[, (i - 1) %/% 4 + 1] + rnorm(n, sd = sqrt(0.5)))
  colnames(y) <- paste0("y", 1:40)
  write.csv(y, file.path(dir, "big.csv"), row.names = FALSE)
  quit()
}

fitOnce <- function(model, S, n, start = "default", orthogonal = TRUE) {
  f <- sem(model, sample.cov = S, sample.nobs = n, likelihood = "wishart", information = "expected",
           orthogonal = orthogonal, start = start)
  fitMeasures(f, c("chisq", "cfi", "tli", "rmsea", "rmsea.ci.lower", "rmsea.ci.upper", "srmr"))
  f
}
timeIt <- function(reps, expr, rounds = 3) {
  best <- Inf
  for (r in 1:rounds) {
    t0 <- proc.time()[["elapsed"]]
    for (i in 1:reps) force(expr())
    best <- min(best, (proc.time()[["elapsed"]] - t0) / reps)
  }
  best
}

hs <- read.csv("testdata/reference/latent/hs.csv")
hsS <- cov(hs[, paste0("x", 1:9)])
hsModel <- "visual =~ x1 + x2 + x3\n textual =~ x4 + x5 + x6\n speed =~ x7 + x8 + x9"
cat("hs_cfa", timeIt(20, function() fitOnce(hsModel, hsS, 301, orthogonal = FALSE)), "\n")
big <- read.csv(file.path(dir, "big.csv"))
bigS <- cov(big)
cat("big", timeIt(5, function() fitOnce(syntax(0:3), bigS, 500)), "\n")
declared <- fitOnce(syntax(0:3), bigS, 500)
perms <- function(v) if (length(v) == 1) list(v) else do.call(c, lapply(seq_along(v), function(i)
  lapply(perms(v[-i]), function(p) c(v[i], p))))
orders <- perms(0:3)
chisq <- sapply(orders, function(o) fitMeasures(fitOnce(syntax(o), bigS, 500, start = declared), "chisq"))
if (diff(range(chisq)) > 1e-6) stop("the members' chi-squares differ: ", paste(chisq, collapse = " "))
refitAll <- function() for (o in orders) fitOnce(syntax(o), bigS, 500, start = declared)
cat("class24", timeIt(1, refitAll, rounds = 1), "\n")

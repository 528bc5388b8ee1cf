# Writes R's bundled airquality data (datasets package, shipped with
# Debian's r-base-core) as CSV, NA for missing. Run: Rscript export.R
write.csv(airquality, "airquality.csv", row.names = FALSE, na = "NA")

# Reference values for DeLong variance, CI and paired test from pROC
# (Robin et al. 2011, BMC Bioinformatics 12:77), and Wilson intervals from
# R's prop.test. Run: /usr/bin/Rscript delong_proc.R
# Writes delong_data.csv (the input data the Go tests read),
# proc_roc_s1.csv (pROC's ROC points for s1), and prints the
# numbers pasted into delong_test.go and interval_test.go.
suppressMessages(library(pROC))
options(digits = 15)
set.seed(20261202)
m <- 60; n <- 80
truth <- c(rep(1, m), rep(0, n))
latent <- rnorm(m + n) + 1.0 * truth
# one decimal place so that ties occur within and across classes
s1 <- round(latent + rnorm(m + n, sd = 0.5), 1)
s2 <- round(0.6 * latent + rnorm(m + n, sd = 0.8), 1)
write.csv(data.frame(truth = truth, s1 = s1, s2 = s2), "delong_data.csv",
          row.names = FALSE, quote = FALSE)

r1 <- roc(truth, s1, levels = c(0, 1), direction = "<", quiet = TRUE)
r2 <- roc(truth, s2, levels = c(0, 1), direction = "<", quiet = TRUE)
# ROC points of s1 as pROC reports them (thresholds are pROC's midpoints,
# so only the (sensitivity, specificity) pairs are compared).
co <- coords(r1, "all", ret = c("sensitivity", "specificity"), transpose = FALSE)
write.csv(co, "proc_roc_s1.csv", row.names = FALSE, quote = FALSE)
cat("auc1 ", format(as.numeric(auc(r1)), digits = 15), "\n")
cat("var1 ", format(var(r1, method = "delong"), digits = 15), "\n")
cat("ci1  ", format(as.numeric(ci.auc(r1, method = "delong", conf.level = 0.95)), digits = 15), "\n")
cat("auc2 ", format(as.numeric(auc(r2)), digits = 15), "\n")
cat("var2 ", format(var(r2, method = "delong"), digits = 15), "\n")
cat("cov12", format(cov(r1, r2, method = "delong"), digits = 15), "\n")
t <- roc.test(r1, r2, method = "delong", paired = TRUE)
cat("Z    ", format(as.numeric(t$statistic), digits = 15), "\n")
cat("p    ", format(t$p.value, digits = 15), "\n")

# Hanley & McNeil (1982) Table 1 rating data (from memory): 58 normal and
# 51 abnormal CT images on a five-point scale.
normal <- rep(1:5, c(33, 6, 6, 11, 2))
abnormal <- rep(1:5, c(3, 2, 2, 11, 33))
rh <- roc(c(rep(0, 58), rep(1, 51)), c(normal, abnormal), levels = c(0, 1),
          direction = "<", quiet = TRUE)
cat("hm_auc", format(as.numeric(auc(rh)), digits = 15), "\n")
cat("hm_var", format(var(rh, method = "delong"), digits = 15), "\n")

# Wilson intervals: prop.test's interval is the score interval of
# Newcombe (1998) method 3 (correct = FALSE) and method 4 (correct = TRUE).
for (xn in list(c(81, 263), c(15, 148), c(0, 20), c(1, 29), c(29, 29), c(23, 60))) {
  a <- prop.test(xn[1], xn[2], correct = FALSE)$conf.int
  b <- prop.test(xn[1], xn[2], correct = TRUE)$conf.int
  cat(sprintf("wilson %d/%d  %.15g %.15g   cc %.15g %.15g\n", xn[1], xn[2], a[1], a[2], b[1], b[2]))
}

// Package latent estimates each rater's error rates and each item's true
// class without a gold standard, by the Dawid–Skene latent-class model fitted
// with EM.
package latent

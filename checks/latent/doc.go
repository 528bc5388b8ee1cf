// Package latent fits linear structural equation models with latent
// variables by maximum likelihood.
package latent

// Package latent fits linear structural equation models with latent
// variables by maximum likelihood: constructs measured by several
// indicators, a DAG of structural arrows among the constructs and the
// observed variables that measure none, and optional residual
// covariances between indicators. Like the other numerical cores it works
// on node indices and gonum matrices and knows nothing of packages or
// reports.
//
// # Model
//
// Nodes 0..p−1 are the observed variables (the rows of S), nodes p..p+k−1
// the latents (Spec). Each indicator loads on one latent; the first of a
// latent's indicators is its marker, loading fixed at 1. Every node has a
// free variance term (an indicator's residual variance, an endogenous
// node's disturbance variance, a source's variance); sources' covariances
// are free unless Spec.IndependentSources. In the reticular action form
// (McArdle & McDonald 1984), with A the loadings and paths, P the
// variances and covariances of the exogenous terms and F the selection
// of the observed nodes,
//
//	Σ(θ) = F (I − A)⁻¹ P (I − A)⁻ᵀ Fᵀ.
//
// # Estimation
//
// Maximum likelihood under multivariate normality (Jöreskog 1967, 1969):
//
//	F_ML(θ) = ln|Σ(θ)| − ln|S| + tr(S Σ(θ)⁻¹) − p,   T = n* F_ML,
//
// n* = N − 1 with S the unbiased covariance (Wishart, the default and
// checks/sem's convention) or n* = N with S the ML covariance (Normal);
// both give the same estimates up to S's scale, and the reference values
// in testdata/reference/latent cover both. The analytic gradient is
// tr(Ω ∂Σ/∂θ) with Ω = Σ⁻¹(Σ − S)Σ⁻¹; the expected information (per case,
// times 2) is H_ab = tr(Σ⁻¹ ∂_aΣ Σ⁻¹ ∂_bΣ) (Browne 1974; Bollen 1989,
// Structural Equations with Latent Variables, ch. 4). The default
// optimizer is Fisher scoring with step halving (Jennrich & Sampson 1976;
// Lee & Jennrich 1979), which near the minimum takes Newton steps on the
// exact Hessian of F_ML (hessian; scoring alone converges linearly when
// the model misfits); Options.Method selects gonum's BFGS instead, whose
// end point scoring polishes. Iterations stop when the scoring
// step's predicted decrease ½ gᵀH⁻¹g is at most Options.Tolerance, a
// criterion free of the data's units. Starting values follow the
// composite-correlation rule (defaultStart) or, for a refit of another
// structural graph over the same measurement model, the warm fit's
// measurement estimates and structural values regressed from its implied
// covariance of the structural nodes (exact for a Markov-equivalent DAG).
// Standard errors: Cov(θ̂) = 2 H(θ̂)⁻¹ / n*, H the expected information
// or, with Options.Information, the exact Hessian (observed information).
//
// # Results
//
// Fit indices as checks/sem (χ², df, p, RMSEA with its 90% interval from
// checks/sem's noncentral χ² (Steiger 1990; Browne & Cudeck 1993), CFI
// (Bentler 1990), TLI (Tucker & Lewis 1973), SRMR, AIC, BIC) against the
// independence baseline. The standardized solution scales every node to
// unit implied variance; residual covariances become residual
// correlations. Per latent: standardized loadings, McDonald's ω
// (McDonald 1999, Test Theory: A Unified Treatment, ch. 6; residual
// covariances among the items in the error part, Raykov 2001) and the
// average variance extracted (Fornell & Larcker 1981). Effect and
// IndirectEffect give total, chained and indirect effects from
// (I − B)⁻¹ (Bollen 1987) with delta-method SEs (Sobel 1986).
//
// # Failures
//
// Never a panic or a silent number: a bad Spec is a *SpecError naming its
// field; an unidentified model an *UnidentifiedError (a latent with one
// indicator, or two and nothing joining it to the rest; df < 0; a
// singular information matrix, at the start or at the estimates, with
// the parameters of its null space); a fit that stops short a
// *NotConvergedError (iterations, largest gradient entry, cause). An
// improper solution is returned with Result.Problems (negative variances,
// standardized loadings beyond ±1, latent or residual covariance
// matrices not positive definite; Bollen 1989, ch. 7) and Proper false.
// The optimizers and the interval's root finding watch the context.
//
// # Equivalence
//
// With IndependentSources the structural part is exactly the DAG model,
// so Markov-equivalent structural DAGs (Verma & Pearl 1990) imply the same
// covariance sets and give the same χ² (the tests reverse covered edges,
// Chickering 1995, and enumerate classes with checks/dag). With free
// source covariances the model is the DAG with its sources joined, and two
// equivalent DAGs with different sets of sources can differ.
//
// # Outside checks
//
// testdata/reference/latent/make_reference.R (the R SEM reference,
// Debian's R SEM package) fits Holzinger & Swineford (1939) and Bollen's
// (1989) political democracy data; TestFit_Reference holds every fit
// measure, estimate, SE, standardized value and defined effect to 1e-4
// relative, and the SEs from the observed information too.
package latent

// Package gust estimates the run-to-run scatter of the along-road wind from
// what the adapters observe, and turns it into the covariance the windows
// (or readings) of one run share.
//
// The along-road wind of a pass is the session mean w plus a deviation d_r
// per run r (one pass in one direction), d_r ~ N(0, σ_g²). To first order
// a deviation changes the dynamic pressure of an observation at ground
// speed V by ρ·V·d (q = ½ρ(V + d)²), so an observation whose lift term is
// β·q moves by c = β̂·ρ·V·Dir per m/s of d, with β̂ a pilot estimate of the
// lift. The observations of one run then share
//
//	Cov(y_i, y_j) = c_i·c_j·σ_g²
//
// The ride-height adapter writes d_r as an additive nuisance per run,
// named by the log file and the run's start, so every sensor of that log
// shares it; the pressure adapter, whose readings name no run, adds the
// rank-one block σ_g²·c·cᵀ to each reading's covariance. σ_g is estimated
// from the run-to-run residuals of the pilot fit by its marginal posterior
// under a half-normal prior of scale air.gust_sd_ms (evaluated on a grid),
// and the posterior mean of σ_g² is used: an empirical-Bayes plug-in, not a
// full hierarchical fit.
package gust

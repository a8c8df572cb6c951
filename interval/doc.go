// Package interval computes confidence intervals for binomial proportions:
// one proportion (Proportion), the difference, ratio and odds ratio of two
// independent proportions (Difference, Ratio, OddsRatio), the difference
// of paired proportions and the ratio of discordant counts of a matched
// table (PairedDifference, DiscordantRatio), and the exact coverage and
// expected width of any one-proportion method (Coverage and the sweeps).
//
// Results in clinical studies, safety-critical acceptance or other
// decisions that can hurt someone must be reviewed by a qualified
// statistician against the applicable regulations, standards and local
// practice; this package computes the published methods accurately, it
// does not choose the design.
package interval

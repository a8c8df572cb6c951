// Package test provides hypothesis tests for binomial data: one sample
// (k successes in n trials), two independent samples and paired data.
package test

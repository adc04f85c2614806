package rank

// MethodText returns the "Uncertainty and ranking" section of the method
// text: plain text with an underlined heading (the layout of rank/method),
// ending in a newline. It states exactly what Run does, with sources, so the
// methods command and the workbook's method sheet can print it.
func MethodText() string { return methodText }

const methodText = `Uncertainty and ranking
-----------------------
Inputs. Each catalog value becomes a probability distribution in its key's
physical domain (mass, radius > 0; 0 <= e < 1; 0 <= albedo <= 1; ...):
  no uncertainty          fixed value
  symmetric sigma         normal N(value, sigma^2) truncated to the domain
  asymmetric +s1 -s2      split normal with mode = value, sigma s2 below and
                          s1 above (John 1982; Wallis 2014), truncated
  range [min, max]        uniform on [min, max] within the domain
  factor x/÷ f            log-normal with median = value, sigma_ln = ln f,
                          truncated
Truncation samples the truncated law exactly: rejection from the untruncated
normal while at least 30 % of its mass lies in the domain (at most 32 tries),
otherwise inversion X = mu + sigma Phi^-1(U), U uniform on [Phi(a), Phi(b)],
evaluated in the tail nearer the domain; a draw never leaves the domain. The
moments reported for each distribution are those of the truncated law
(Johnson, Kotz & Balakrishnan 1994, eqs. 13.134-13.135).
A missing input takes the profile's prior (fixed, normal, split-normal,
uniform, log-normal or log-uniform; k2/Q is usually log-uniform over
decades); it is marked "assumed" in every output with the prior's
description, and is never written back to the catalog. Derived inputs: with no
mass (or no radius) but a bulk density, the missing one follows from
rho = 3m/(4 pi R^3) sample by sample; with no k2/Q but k2 and Q, k2/Q is the
ratio of the sampled k2 and Q. Catalog values always win over priors. A moon that lacks a
required input with no prior for it is not ranked and is listed as excluded,
with the missing keys.

Sampling. Each moon gets N samples (default 10,000) of all its inputs,
independent between inputs. Each input is drawn in chunks of 1,024 samples
from its own PCG generator stream (math/rand/v2), seeded from (seed, a hash of
the input's key and of the names of the body that owns it, chunk number)
through SplitMix64 (Steele, Lea & Flood 2014). A moon's samples therefore
depend only on the seed and on that moon, whatever other moons are ranked and
however many processors share the work: the same catalog revision, profile,
seed and sample count give byte-identical output on one platform (last-bit
differences of floating-point functions between architectures aside; the
output names its GOARCH). A planet's or star's values (planet mass, distance
from the star, luminosity) are the same draw in sample j for every moon of
that planet or star, so the joint ranking keeps the correlation they induce.

Scores. In each sample the physical model is evaluated and every criterion
maps its metric x to [0, 1]: ramp (0 at lo, 1 at hi, linear between, clamped;
lo > hi scores low values higher), log ramp (the same on log10 x), or window
(1 on [lo, hi], falling linearly to 0 over "soft" outside each edge). A metric
the model cannot compute in a sample scores 0 there (each moon's notes say
which reported metrics could not be computed in how many samples). Indicator
metrics (ocean; retains:GAS) are 0 or 1 per sample, so their weight makes the
mean score follow a probability. The composite score is sum(w_i T_i) /
sum(w_i), in [0, 1], so each moon's score is a distribution.

Summaries. Quantiles are the 5th, 50th and 95th percentiles by linear
interpolation between order statistics (Hyndman & Fan 1996, type 7), over the
samples where a quantity could be computed. The ocean probability is the
fraction of samples with an ocean at least the profile's minimum thickness
thick; its Monte Carlo standard error is the binomial sqrt(p(1-p)/N), which is
0 at p = 0 or 1 and then says nothing about how rare an ocean might still be.
Retention probabilities are fractions of samples in which each gas is retained.
The standard error of the median score is the McKean & Schrader (1984)
estimate (x(N-c+1) - x(c)) / (2 z), c = round((N+1)/2 - z sqrt(N/4)),
z = 2.576: the half-width of the order-statistic confidence interval of the
median, an estimate of 1/(2 f(median) sqrt(N)) that needs no density
estimate. Both standard errors fall as 1/sqrt(N): four times the samples
halve them.

Ranking. The samples of all moons form a joint sample: in sample j every moon
is ranked by its score (1 = best), so the ranks in every sample are a
permutation of 1..M. Exactly equal scores (common where transfer functions
clamp at 0 or 1) are put in random order, independently in each sample, by a
hash of (seed, sample, moon), so that no moon gains from its place in the
catalog. Scores are ranked at single precision (float32), so scores closer
than about 1e-7 count as equal. Each moon's median rank and
5-95 % rank interval are type-7 quantiles of its ranks over the N samples, and
P(rank <= k) is the fraction of samples in which it ranks in the top k; summed
over all moons these probabilities are exactly k. Moons are listed by median
rank, then median score, then name. Apart from the shared planet and star
values, inputs are independent between moons.

Drivers. For each moon the share of its score variance owed to each uncertain
input is its first-order sensitivity index S_i = V(E[score | X_i]) / V(score)
(Sobol' 1993), estimated from the same samples without further model runs by
the given-data binning estimator of Plischke, Borgonovo & Smith (2013): the
range of X_i between the 0.5 % and 99.5 % quantiles of its distribution is
cut into M classes of equal width (M = floor(sqrt(N)/3) within 2..50, 33 for
10,000 samples; equal width in log X_i for log-normal and log-uniform inputs,
so that classes hold similar shares of the samples; values beyond the ends
join the end classes), and S_i is the between-class variance of the class
means of the score over its total variance, corrected for its noise bias by
Kelley's (1935) adjustment and clipped to [0, 1]. Shares need not add to 1:
the remainder is owed to interactions between inputs. The input with the
largest share is the measurement that would most narrow the moon's score.
On the Ishigami test function (Ishigami & Homma 1990) the estimator
reproduces the analytic first-order indices 0.314, 0.442 and 0 within 0.03.

Sources for this section: Hyndman R. J. & Fan Y. 1996, Am. Stat. 50, 361.
Ishigami T. & Homma T. 1990, Proc. ISUMA '90, 398. John S. 1982, Commun.
Statist. Theory Meth. 11, 879. Johnson N. L., Kotz S. & Balakrishnan N. 1994,
Continuous Univariate Distributions vol. 1, 2nd ed., Wiley. Kelley T. L. 1935,
PNAS 21, 554. McKean J. W. & Schrader R. M. 1984, Commun. Statist. Simul.
Comput. 13, 751. Plischke E., Borgonovo E. & Smith C. L. 2013, Eur. J. Oper.
Res. 226, 536. Sobol' I. M. 1993, Math. Model. Comput. Exp. 1, 407. Steele
G. L., Lea D. & Flood C. H. 2014, OOPSLA '14, 453. Wallis K. F. 2014, Statist.
Sci. 29, 106.
`

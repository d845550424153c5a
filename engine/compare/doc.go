// Package compare holds the statistics of treated-against-control
// comparisons of weathering budgets, for enhanced-weathering monitoring
// (docs/methods.md §17): the difference between catchments, or periods, of
// the fluxes two or four budgets give, with intervals from paired bootstrap
// replicates; the CO2 potential of a rock feedstock and the share of it a
// measured extra flux represents; and the monitoring design, the smallest
// increase a sampling programme can detect.
//
// # Designs
//
// TreatedControl takes treated − control over the same period (paired
// catchments). BACI, before-after-control-impact, takes (after − before)
// of the treated catchment less (after − before) of the control, which
// removes both a fixed difference between the catchments and a change
// common to both between the periods (Green 1979; Stewart-Oaten, Murdoch &
// Parker 1986, Ecology 67, 929–940; from memory). Budgets are given in the
// order treated, control, treated before, control before (Design.Signs).
//
// # Paired replicates
//
// Pair bootstraps one quantity (silicate cations, say) of every budget
// with flux.BootstrapApportioned and forms the difference replicate by
// replicate. What the budgets share is drawn once per replicate for all of
// them: when their Monte Carlo draw d stands for the same end-member ratios
// and rain ratios in every sample (one end-member table and one rain
// correction serve them all, with one seed), JointDraws picks one draw
// number per replicate from the joint weights of every sample of every
// budget, and each budget's bootstrap takes it (flux.BootstrapOptions
// DrawNumbers), so the shared part partly cancels in the difference. What
// each budget has of its own — the resampling of its samples, the
// systematic error of its discharge record, the error of its area — is
// drawn from a seed of its own (BudgetSeed). Where no joint draws exist —
// an apportionment whose weighted draws belong to each sample, as the
// inverse model's do — Pair goes without Picks: each budget's bootstrap
// takes each sample's draw by its weight, independently in each budget,
// and the uncertainty the budgets share is not carried as shared (the
// caller says so). The difference's interval is
// the 2.5 % and 97.5 % quantiles of the replicate differences; P(D > 0) is
// the share of replicates above zero. Each quantity is given per km² of
// catchment (mol/km²/yr) and per mm of runoff (mol/km²/mm, which is the
// flow-weighted mean concentration in µmol/L), since wet and dry years
// differ.
//
// # Feedstock
//
// Oxides.Charge is the cation charge a feedstock can release, mol/kg, from
// its CaO, MgO, Na2O and K2O contents; Oxides.Potential its CO2 uptake, t
// CO2 per t, at η mol CO2 per mol of charge (1 as bicarbonate in fresh
// water). The form is the one Renforth (2012), Int. J. Greenh. Gas Control
// 10, 229–243, published (from memory).
//
// # Monitoring design
//
// Detect simulates monitoring programmes on a budget's own data: its
// discharge record, and concentrations made from its samples' relation of
// concentration to discharge (ln C = b0 + b1 ln Q) with its own residuals
// resampled; each programme is fluxed with the budget's estimator. The
// simulated difference between identical catchments gives the null
// distribution of the design; an increase δ of the treated catchment's
// flux is detected when the difference leaves the null's central 1 − α.
// The smallest δ detected in a share `power` of programmes is the
// detectable increase. For normal errors of equal variance and a plain
// mean it is (z_(1−α/2) + z_power) σ √(2/n) (common practice), which the
// tests check. SamplesPerYear is the reverse: the sampling frequency that
// detects a given increase.
//
// # Reproducibility
//
// Every random path is seeded (PCG) and uses the flux package's portable
// exp and log, so a seed gives the same bits natively and in WebAssembly.
package compare

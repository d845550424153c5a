// Package flux turns sparse concentration samples and a daily discharge
// record into annual solute fluxes, specific yields and their uncertainty.
package flux

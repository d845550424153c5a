package carbonate

import "math"

// KelvinOffset converts °C to kelvin.
const KelvinOffset = 273.15

// Constants are the log10 equilibrium constants of the carbonate system at
// one temperature (1 atm).
type Constants struct {
	TempC float64 // temperature, °C
	LogK1 float64 // H2CO3* = H⁺ + HCO3⁻
	LogK2 float64 // HCO3⁻ = H⁺ + CO3²⁻
	LogKH float64 // CO2(g) = H2CO3*, mol/kg/atm
	LogKw float64 // H2O = H⁺ + OH⁻
	// LogKcal, LogKarg and LogKdol are the solubility products of
	// calcite and aragonite (CaCO3 = Ca²⁺ + CO3²⁻) and of dolomite
	// (CaMg(CO3)2 = Ca²⁺ + Mg²⁺ + 2 CO3²⁻).
	LogKcal, LogKarg, LogKdol float64
}

// ValidMinC and ValidMaxC bound the temperatures of the Plummer &
// Busenberg (1982) equations (0–90 °C at 1 atm).
const (
	ValidMinC = 0.0
	ValidMaxC = 90.0
)

// LogK1 returns log10 K1 of carbonic acid at tC °C (Plummer & Busenberg
// 1982, Geochim. Cosmochim. Acta 46, 1011–1040; docs/methods.md §10.1).
func LogK1(tC float64) float64 {
	T := tC + KelvinOffset
	return -356.3094 - 0.06091964*T + 21834.37/T + 126.8339*math.Log10(T) - 1684915/(T*T)
}

// LogK2 returns log10 K2 of bicarbonate at tC °C (Plummer & Busenberg 1982).
func LogK2(tC float64) float64 {
	T := tC + KelvinOffset
	return -107.8871 - 0.03252849*T + 5151.79/T + 38.92561*math.Log10(T) - 563713.9/(T*T)
}

// LogKH returns log10 of Henry's constant of CO2 (mol/kg/atm) at tC °C
// (Plummer & Busenberg 1982).
func LogKH(tC float64) float64 {
	T := tC + KelvinOffset
	return 108.3865 + 0.01985076*T - 6919.53/T - 40.45154*math.Log10(T) + 669365/(T*T)
}

// LogKcal returns log10 of the solubility product of calcite at tC °C
// (Plummer & Busenberg 1982).
func LogKcal(tC float64) float64 {
	T := tC + KelvinOffset
	return -171.9065 - 0.077993*T + 2839.319/T + 71.595*math.Log10(T)
}

// LogKarg returns log10 of the solubility product of aragonite at tC °C
// (Plummer & Busenberg 1982; the equation is from memory, docs/methods.md
// §10.1 and §14).
func LogKarg(tC float64) float64 {
	T := tC + KelvinOffset
	return -171.9773 - 0.077993*T + 2903.293/T + 71.595*math.Log10(T)
}

// LogKw returns log10 of the ion product of water at tC °C: −4470.99/T +
// 6.0875 − 0.01706 T (Stumm & Morgan 1996, Aquatic Chemistry; from memory,
// docs/methods.md §10.1).
func LogKw(tC float64) float64 {
	T := tC + KelvinOffset
	return -4470.99/T + 6.0875 - 0.01706*T
}

// Dolomite: log K at 25 °C and the reaction enthalpy of ordered dolomite,
// CaMg(CO3)2 = Ca²⁺ + Mg²⁺ + 2 CO3²⁻: −17.09 and −9.436 kcal/mol
// (Nordstrom, Plummer, Langmuir, Busenberg, May, Jones & Parkhurst 1990,
// "Revised chemical equilibrium data for major water–mineral reactions",
// ACS Symp. Ser. 416, 398–413; from memory). Disordered dolomite is about
// half a log unit more soluble (−16.54, same source, from memory).
const (
	LogKdol25        = -17.09
	DolomiteEnthalpy = -9.436 * 4184 // J/mol
)

// gasConstant is the molar gas constant, J/(mol K) (CODATA 2018, exact).
const gasConstant = 8.314462618

// LogKdol returns log10 of the solubility product of ordered dolomite at
// tC °C from LogKdol25 and DolomiteEnthalpy by the van 't Hoff equation
// (enthalpy taken constant with temperature).
func LogKdol(tC float64) float64 {
	T := tC + KelvinOffset
	return LogKdol25 - DolomiteEnthalpy/(gasConstant*math.Ln10)*(1/T-1/298.15)
}

// At returns every constant at tC °C.
func At(tC float64) Constants {
	return Constants{TempC: tC, LogK1: LogK1(tC), LogK2: LogK2(tC), LogKH: LogKH(tC), LogKw: LogKw(tC),
		LogKcal: LogKcal(tC), LogKarg: LogKarg(tC), LogKdol: LogKdol(tC)}
}

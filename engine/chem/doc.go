// Package chem holds the chemical species Lixiv knows, their charges and
// molar masses, the concentration units laboratories report in, and exact
// conversions between them.
package chem

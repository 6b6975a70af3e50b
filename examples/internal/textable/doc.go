// Package textable prints aligned plain-text tables for the examples:
// text columns aligned left, number columns right, two spaces between.
package textable

// Package model reads phigrid model files: a human-written TOML description
// of an electrostatic problem, parsed strictly into the types of package bc.
package model

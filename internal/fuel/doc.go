// Package fuel owns Larder's computation: body composition, glycogen stores,
// daily carbohydrate targets by training load, carbohydrate loading,
// race-day fuelling, post-exercise repletion, a glycogen simulation and the
// findings that check every figure against published guidelines. It is pure
// Go: no I/O, no database, no HTTP.
package fuel

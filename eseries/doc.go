// Package eseries handles the values real parts come in: the IEC 60063
// preferred-number series (E3 to E192), explicit stock lists, and the text
// forms in which part values are written.
//
// A Set is a set of allowed values. A *Series such as E24 is a Set over many
// decades; a *List holds explicit values, such as the parts in a drawer; and
// Range narrows any Set to an interval. Below, Above, Next, Prev and
// Contains answer neighbour questions, and treat values closer than RelTol
// (relative) as the same value.
//
// SnapTo fits a wanted value to a Set, returning the members on either side
// and the nearest of them on a log scale, with their relative errors.
//
// Parse reads values in the forms the trade writes them: plain numbers
// ("4700", "4.7e3"), SI prefixes with optional units ("4.7k", "100nF",
// "10mH", "1 kΩ", "1meg") and IEC 60062 RKM codes ("4k7", "2n2", "R47").
// Format writes the short engineering form ("4.7k", "2.2n", "470p").
//
// Series members are the float64 nearest to the decimal value, and Parse
// returns the float64 nearest to the decimal written, so a series member
// and the parsed text for it compare equal: Parse("2n2") == 2.2e-9, and
// E24 holds exactly that value.
package eseries

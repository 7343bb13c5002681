package web

// FactInput is the name of a food form's box for one dietary fact.
func FactInput(code string) string { return "fact_" + code }

// NeedInput is the name of the dietary-needs form's box for one need.
func NeedInput(code string) string { return "need_" + code }

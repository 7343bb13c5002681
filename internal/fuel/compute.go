package fuel

import "errors"

// Compute builds the plan a request asks for. Bad input yields a
// ValidationError.
func Compute(req Request) (Plan, error) {
	if err := req.Validate(); err != nil {
		return Plan{}, err
	}
	return Plan{}, errors.New("fuel: computation not implemented yet")
}

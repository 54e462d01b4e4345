package policies_test

import (
	"fmt"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/policies"
)

// A built-in pack, converted to the units of a model in feet.
func ExamplePack() {
	p, diags := policies.Pack("strict")
	if diags.HasErrors() {
		fmt.Println(diags)
		return
	}
	us := p.In(model.US)
	fb := us.Rules["freeboard"]
	concrete, _ := us.Rules["max_velocity"].Limit.For("concrete")
	_, sandChecked := us.Rules["min_velocity"].Limit.For("sand")
	fmt.Println(us.Chain)
	fmt.Printf("freeboard: at least %.3f ft or %.0f %% of the depth (%s, from %s)\n", fb.Minimum, 100*fb.Fraction, fb.Severity, fb.File)
	fmt.Printf("concrete: at most %.2f ft/s\n", concrete)
	fmt.Println("minimum velocity checked in sand:", sandChecked)
	// Output:
	// [pack:strict pack:baseline]
	// freeboard: at least 0.984 ft or 30 % of the depth (error, from pack:strict)
	// concrete: at most 19.69 ft/s
	// minimum velocity checked in sand: false
}

// Every configurable rule with its default severity.
func ExampleDefaultSeverity() {
	for _, id := range policies.Configurable() {
		fmt.Println(id, policies.DefaultSeverity(id))
	}
	// Output:
	// freeboard error
	// froude_band warning
	// jump_containment error
	// jump_type warning
	// max_velocity error
	// min_velocity warning
	// shear_stress error
	// superelevation error
}

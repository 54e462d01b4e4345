package policies_test

import (
	"fmt"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/rules"
)

// A built-in pack, converted to the units of a model in feet.
func ExampleLanguage_Pack() {
	p, diags := rules.Language().Pack("review")
	if diags.HasErrors() {
		fmt.Println(diags)
		return
	}
	us := p.In(model.US)
	fb := us.Rules["freeboard"]
	concrete, _ := us.Rules["max_velocity"].Table("limit").For("concrete")
	_, sandChecked := us.Rules["min_velocity"].Table("limit").For("sand")
	fmt.Println(us.Chain, us.Version)
	fmt.Printf("freeboard: at least %.3f ft or %.0f %% of the depth (%s, from %s)\n", fb.Number("minimum"), 100*fb.Number("fraction"), fb.Severity, fb.File)
	fmt.Printf("concrete: at most %.2f ft/s\n", concrete)
	fmt.Println("minimum velocity checked in sand:", sandChecked)
	// Output:
	// [pack:review pack:strict pack:baseline] 2026.1
	// freeboard: at least 0.984 ft or 30 % of the depth (error, from pack:strict)
	// concrete: at most 19.69 ft/s
	// minimum velocity checked in sand: false
}

// Every configurable rule with its default severity.
func ExampleLanguage_Configurable() {
	lang := rules.Language()
	for _, id := range lang.Configurable() {
		fmt.Println(id, lang.Spec(id).Severity)
	}
	// Output:
	// bed_slope error
	// bend_radius warning
	// bottom_width error
	// freeboard error
	// froude_band warning
	// headwater error
	// jump_containment error
	// jump_type warning
	// max_velocity error
	// min_velocity warning
	// no_rise error
	// outlet_velocity warning
	// overtopping error
	// public_safety error
	// sensitivity warning
	// shear_stress error
	// side_slope error
	// superelevation error
}

package records

import (
	"errors"
	"fmt"
	"reflect"
	"strconv"
	"strings"
	"sync"
	"unsafe"

	"github.com/go-playground/validator/v10"
)

// validate is shared by every file and goroutine: building a validator
// caches struct descriptions, and it is safe for concurrent use.
var validate = sync.OnceValue(func() *validator.Validate {
	v := validator.New(validator.WithRequiredStructEnabled())
	// Namespaces use the YAML key, so facility.yaml errors name what the user wrote.
	v.RegisterTagNameFunc(func(f reflect.StructField) string {
		name, _, _ := strings.Cut(f.Tag.Get("yaml"), ",")
		if name == "-" {
			return ""
		}
		return name
	})
	// Registration fails only for an empty tag name or a nil function.
	_ = v.RegisterValidation("id", func(fl validator.FieldLevel) bool { return isID(fl.Field().String()) })
	_ = v.RegisterValidation("code", func(fl validator.FieldLevel) bool { return IsCode(fl.Field().String()) })
	return v
})

// verdict validates a decoded cell against its field's validate tag, once
// per distinct cell of the column.
func (d *decoder) verdict(ci int, fp unsafe.Pointer, f *field, cell string) string {
	m := d.verdicts[ci]
	if v, ok := m[cell]; ok {
		return v.reason
	}
	reason := ""
	if err := validate().Var(reflect.NewAt(f.typ, fp).Elem().Interface(), f.vtag); err != nil {
		var ves validator.ValidationErrors
		if errors.As(err, &ves) && len(ves) > 0 {
			reason = d.describe(ves[0], f, ci, cell)
		} else {
			reason = err.Error()
		}
	}
	if len(m) < 1<<16 {
		v := &verdict{reason: reason}
		m[strings.Clone(cell)] = v
		if f.kind == kString {
			v.val = *(*string)(fp)
			d.follow(ci, v)
		}
	}
	return reason
}

// describe turns a validator error into a reason a keeper can act on.
func (d *decoder) describe(fe validator.FieldError, f *field, ci int, cell string) string {
	val := cell
	if fe.Kind() == reflect.String {
		val = fe.Value().(string) // a list element, or the cell
	}
	switch fe.Tag() {
	case "required":
		return "is required but empty"
	case "oneof":
		return fmt.Sprintf("%q is not one of %s", val, strings.ReplaceAll(fe.Param(), " ", ", "))
	case "id":
		return fmt.Sprintf("%q is not an id (1 to 64 letters, digits or - _ . : /)", val)
	case "code":
		return fmt.Sprintf("%q is not a lower_snake_case code", val)
	case "gt", "gte", "lt", "lte":
		return rangeReason(f, d.unitOf(ci), cell, fe)
	}
	return fmt.Sprintf("%q fails the %s %s check", val, fe.Tag(), fe.Param())
}

func (d *decoder) unitOf(ci int) *unitAlt {
	if ci < 0 {
		return nil
	}
	return d.p.cols[ci].alt
}

// rangeReason explains an implausible measurement in the unit it was written
// in and, after conversion, in the SI unit the range is stated in:
// "-130 °F (-90.0 °C) is outside the plausible range -80 … 60 °C".
func rangeReason(f *field, alt *unitAlt, cell string, fe validator.FieldError) string {
	si := ""
	if f.unit != "" {
		si = " " + units[f.unit][0].label
	}
	shown := cell
	if alt != nil {
		shown += " " + alt.label
		if alt.label != units[f.unit][0].label {
			if v, ok := fe.Value().(float64); ok {
				shown += fmt.Sprintf(" (%s%s)", strconv.FormatFloat(v, 'f', 1, 64), si)
			} else if p, ok := fe.Value().(*float64); ok && p != nil {
				shown += fmt.Sprintf(" (%s%s)", strconv.FormatFloat(*p, 'f', 1, 64), si)
			}
		}
	}
	switch {
	case f.lo != "" && f.hi != "":
		lo := f.lo
		if f.loOpen {
			lo = "> " + lo
		}
		return fmt.Sprintf("%s is outside the plausible range %s … %s%s", shown, lo, f.hi, si)
	case f.lo != "" && f.loOpen:
		return fmt.Sprintf("%s must be above %s%s", shown, f.lo, si)
	case f.lo != "":
		return fmt.Sprintf("%s must be at least %s%s", shown, f.lo, si)
	}
	return fmt.Sprintf("%s must be at most %s%s", shown, f.hi, si)
}

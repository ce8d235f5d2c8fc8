package model_test

import (
	"errors"
	"fmt"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/io/model"
)

const coax = `
title = "Coaxial line"

[units]
length = "mm"

[domain]
kind = "planar"
x = [-3.5, 3.5]
y = [-3.5, 3.5]

[[conductor]]
name = "inner"
potential = 1

[[conductor]]
name = "outer"
potential = 0

[[region]]
kind = "conductor"
conductor = "outer"
annulus = { center = [0, 0], inner_radius = 3, outer_radius = 5 }

[[region]]
kind = "conductor"
conductor = "inner"
circle = { center = [0, 0], radius = 1 }
`

func ExampleParse() {
	m, err := model.Parse("coax.toml", []byte(coax))
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(m.Title, "in", m.Unit.Name)
	for _, c := range m.Problem.Conductors {
		fmt.Printf("conductor %s at %g V\n", c.Name, c.Potential)
	}
	inner := m.Problem.Regions[1].Shape.(bc.Circle)
	fmt.Printf("inner radius %g m\n", inner.R)
	fmt.Println("solver", m.Solver.Method)
	// Output:
	// Coaxial line in mm
	// conductor inner at 1 V
	// conductor outer at 0 V
	// inner radius 0.001 m
	// solver mg-pcg
}

func ExampleError() {
	src := `
[units]
length = "mm"

[domain]
kind = "planar"
x = [0, 10]
y = [0, 10]

[[region]]
kind = "dielectric"
material = "PTFE"
circle = { center = [5, 5], radius = -1 }
`
	_, err := model.Parse("board.toml", []byte(src))
	fmt.Println(err)
	var e *model.Error
	if errors.As(err, &e) {
		fmt.Println("line", e.Line, "key", e.Key, "invalid:", errors.Is(err, model.ErrInvalid))
	}
	// Output:
	// board.toml:13:29: region[1].circle.radius: the radius must be a finite number > 0, got -1 mm
	// line 13 key region[1].circle.radius invalid: true
}

func ExampleMaterials() {
	for _, m := range model.Materials()[:4] {
		fmt.Printf("%-8s %g\n", m.Name, m.EpsR)
	}
	// Output:
	// vacuum   1
	// air      1
	// dry-air  1.00054
	// PTFE     2.1
}

package view

import "image/color"

// OkabeIto is the eight-colour palette of Okabe and Ito, "Color Universal
// Design (CUD): how to make figures and presentations that are friendly to
// colorblind people" (2008), whose colours stay distinct to readers with
// the common colour-vision deficiencies (protan, deutan, tritan). Black
// comes first, then orange, sky blue, bluish green, yellow, blue,
// vermillion and reddish purple.
var OkabeIto = [8]color.RGBA{
	{0x00, 0x00, 0x00, 0xff},
	{0xe6, 0x9f, 0x00, 0xff},
	{0x56, 0xb4, 0xe9, 0xff},
	{0x00, 0x9e, 0x73, 0xff},
	{0xf0, 0xe4, 0x42, 0xff},
	{0x00, 0x72, 0xb2, 0xff},
	{0xd5, 0x5e, 0x00, 0xff},
	{0xcc, 0x79, 0xa7, 0xff},
}

// materialColour is the colour of material i: the palette without black,
// which reads as a shadow on a shaded body.
func materialColour(i int) color.RGBA {
	if i < 0 {
		i = 0
	}
	return OkabeIto[1+i%7]
}

// towardGrey mixes a colour with light grey by the fraction f, so that
// fixtures (f = 0.5) and floors (f = 0.85) stay in the background of the
// moving parts of the same material, and apart from each other.
func towardGrey(c color.RGBA, f float64) color.RGBA {
	mix := func(a uint8) uint8 { return uint8((1-f)*float64(a) + f*215) }
	return color.RGBA{mix(c.R), mix(c.G), mix(c.B), 0xff}
}

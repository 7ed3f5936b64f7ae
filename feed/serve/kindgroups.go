package serve

// kindChoice is one kind the builder offers, with a plain explanation. Its
// label is the kind's name in the feeds' titles and categories ("Civil
// dawn"); the plain words for it, if any, lead the explanation ("first
// light: …").
type kindChoice struct {
	Kind, Label, Explain string
	Checked              bool // chosen when the page opens
	Shift                bool // the builder offers an offset (minutes before or after)
	// Offset is the minutes the offset's input opens with ("": 0), as a
	// query of the page gives them (builderFill).
	Offset string
}

// kindGroup gathers the kinds by what people do with them.
type kindGroup struct {
	ID, Name, Explain string
	Kinds             []kindChoice
	Lighting          bool // the group offers the lamp target
}

// kindGroups are the builder's choices. Every kind is a name of the
// configuration's vocabulary (checked by a test).
var kindGroups = []kindGroup{
	{ID: "growing", Name: "Growing", Explain: "Field work, greenhouses and animals: when the day starts, ends and how long it is.", Lighting: true, Kinds: []kindChoice{
		{Kind: "civil-dawn", Label: "Civil dawn", Explain: "first light: bright enough to work outside without lamps", Checked: true, Shift: true},
		{Kind: "sunrise", Label: "Sunrise", Explain: "the top of the Sun appears over a flat horizon", Checked: true, Shift: true},
		{Kind: "sunset", Label: "Sunset", Explain: "the top of the Sun disappears", Checked: true, Shift: true},
		{Kind: "civil-dusk", Label: "Civil dusk", Explain: "last light: after this, outdoor work needs lamps", Checked: true, Shift: true},
		{Kind: "daily-summary", Label: "Daylight", Explain: "a summary of the day: one all-day note per day with day length and twilight"},
	}},
	{ID: "events", Name: "Events and photography", Explain: "Planning weddings, shoots and outdoor shows around the light.", Kinds: []kindChoice{
		{Kind: "golden-hour", Label: "Golden hour", Explain: "low, warm light around sunrise and sunset: the Sun from 4° below to 6° above the horizon"},
		{Kind: "blue-hour", Label: "Blue hour", Explain: "the deep blue sky just before sunrise and after sunset"},
		{Kind: "solar-noon", Label: "Solar noon", Explain: "the Sun at its highest, the shortest shadows", Shift: true},
	}},
	{ID: "observing", Name: "Observing", Explain: "Telescopes, star parties and night photography.", Kinds: []kindChoice{
		{Kind: "nautical-dusk", Label: "Nautical dusk", Explain: "the horizon fades; the brighter stars are out", Shift: true},
		{Kind: "astronomical-dusk", Label: "Astronomical dusk", Explain: "night begins: the sky is fully dark (Sun 18° down)", Shift: true},
		{Kind: "astronomical-dawn", Label: "Astronomical dawn", Explain: "night ends: the first trace of dawn in the east", Shift: true},
		{Kind: "nautical-dawn", Label: "Nautical dawn", Explain: "the horizon shows again; only the brighter stars are left", Shift: true},
		{Kind: "dark-window", Label: "Dark sky", Explain: "dark, moonless hours: full night with the Moon below the horizon"},
		{Kind: "moonrise", Label: "Moonrise", Explain: "the Moon comes up", Shift: true},
		{Kind: "moonset", Label: "Moonset", Explain: "the Moon goes down", Shift: true},
		{Kind: "moon-phases", Label: "Moon phases", Explain: "new, first quarter, full and last quarter"},
		{Kind: "solar-eclipse", Label: "Solar eclipses", Explain: "eclipses of the Sun seen from here (protect your eyes)"},
		{Kind: "lunar-eclipse", Label: "Lunar eclipses", Explain: "eclipses of the Moon above your horizon"},
	}},
	{ID: "year", Name: "The year", Explain: "The turning points of the seasons.", Kinds: []kindChoice{
		{Kind: "seasons", Label: "Equinoxes and solstices", Explain: "the four starts of the astronomical seasons"},
		{Kind: "cross-quarter", Label: "Cross-quarter days", Explain: "halfway between an equinox and a solstice"},
		{Kind: "perihelion", Label: "Perihelion", Explain: "the Earth closest to the Sun, early January"},
		{Kind: "aphelion", Label: "Aphelion", Explain: "the Earth farthest from the Sun, early July"},
	}},
}

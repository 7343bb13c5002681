package demo

import (
	"larder/internal/store"
)

// practiceFoods are the demo practice's own stock, entered "from the label"
// as a practice would: the reference tables carry no sports products, and
// in-event and repletion feeds want drinks, gels and bars. The products and
// their figures are invented for the demo; each row's energy agrees with the
// Atwater factors of its macronutrients. Bread, the bar and the oats contain
// gluten (wheat; oats not certified gluten-free: common practice). Dietary
// facts: the shake is made up with milk; honey is of animal origin (not
// vegan) and high in excess fructose, as are wheat bread (fructans) and the
// bar with its honey (common practice, from memory).
var practiceFoods = []store.Food{
	{Name: "Harbourside sports drink (6 %)", CarbohydrateG: 6, EnergyKcal: 24, PortionName: "1 bottle (500 ml)", PortionG: 500, Liquid: true, Portable: true, FactsRecorded: true},
	{Name: "Harbourside energy gel", CarbohydrateG: 62, FibreG: 0.5, EnergyKcal: 248, PortionName: "1 sachet (40 g)", PortionG: 40, Portable: true, FactsRecorded: true},
	{Name: "Oat and honey bar", CarbohydrateG: 64, ProteinG: 7, FatG: 12, FibreG: 4, EnergyKcal: 392, PortionName: "1 bar (45 g)", PortionG: 45, Portable: true, ContainsGluten: true,
		Facts: []string{"gluten", "animal", "high_fodmap"}, FactsRecorded: true},
	{Name: "Recovery shake, made up", CarbohydrateG: 12, ProteinG: 5, FatG: 1, EnergyKcal: 77, PortionName: "1 shaker (400 ml)", PortionG: 400, Liquid: true,
		Facts: []string{"lactose", "milk_protein", "animal", "high_fodmap"}, FactsRecorded: true},
	{Name: "White bread, sliced", CarbohydrateG: 49, ProteinG: 8.5, FatG: 2.5, FibreG: 2.7, EnergyKcal: 253, PortionName: "1 slice (35 g)", PortionG: 35, ContainsGluten: true,
		Facts: []string{"gluten", "high_fodmap"}, FactsRecorded: true},
	{Name: "Honey", CarbohydrateG: 82, ProteinG: 0.3, FibreG: 0.2, EnergyKcal: 329, PortionName: "1 tablespoon (21 g)", PortionG: 21, Portable: true,
		Facts: []string{"animal", "high_fodmap"}, FactsRecorded: true},
	{Name: "Rolled oats", CarbohydrateG: 60, ProteinG: 13, FatG: 7, FibreG: 10, EnergyKcal: 355, PortionName: "½ cup, dry (40 g)", PortionG: 40, ContainsGluten: true,
		Facts: []string{"gluten"}, FactsRecorded: true},
}

// foods adds the practice's own foods that are not there yet, by name, so
// loading twice adds nothing and a practice's edits to them are kept.
func (l *loader) foods() error {
	for _, f := range practiceFoods {
		tag, err := l.tx.Exec(l.ctx, `
			INSERT INTO foods (name, carbohydrate_g, protein_g, fat_g, fibre_g, energy_kcal, portion_name, portion_g, liquid, portable, source, contains_gluten, facts, facts_recorded)
			SELECT $1, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11, $12, $13, $14
			WHERE NOT EXISTS (SELECT 1 FROM foods WHERE lower(name) = lower($1))`,
			f.Name, f.CarbohydrateG, f.ProteinG, f.FatG, f.FibreG, f.EnergyKcal, f.PortionName, f.PortionG, f.Liquid, f.Portable, store.SourceLabel, f.ContainsGluten,
			append([]string{}, f.Facts...), f.FactsRecorded)
		if err != nil {
			return err
		}
		l.res.Inserted += int(tag.RowsAffected())
	}
	return nil
}

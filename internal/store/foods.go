package store

import (
	"context"
	"errors"
	"slices"
	"time"

	"github.com/jackc/pgx/v5"

	"larder/internal/menu"
)

// SourceLabel is the source of a practice's own food, entered from its label.
const SourceLabel = "label"

// Food is one row of the foods list: composition per 100 g and a household
// portion. Source is an IFCT 2017 food code (e.g. "A015") or SourceLabel.
type Food struct {
	ID            int64
	Name          string
	CarbohydrateG float64 // per 100 g
	ProteinG      float64
	FatG          float64
	FibreG        float64
	EnergyKcal    float64
	PortionName   string // e.g. "1 medium, peeled (100 g)"
	PortionG      float64
	Liquid        bool // a drink
	Portable      bool // easy to carry and eat on the move
	// ContainsGluten marks wheat, barley, rye and oats (unless certified
	// gluten-free) and foods made from them; suggestions leave them out for
	// a client whose cautions record coeliac disease or gluten.
	ContainsGluten bool
	// Facts are the food's dietary facts (menu.Fact* codes: what it
	// contains); FactsRecorded tells that someone recorded them.
	Facts         []string
	FactsRecorded bool
	Source        string
	// SourceName is the composition table's own name of the food (Name
	// being the everyday one); empty for the practice's own products.
	SourceName string
	// CookedYield is the grams as eaten per gram as weighed for a food
	// eaten cooked but listed dry or raw (rice, dals); 0 when eaten as
	// weighed.
	CookedYield float64
	ArchivedAt  *time.Time
	CreatedAt   time.Time
	UpdatedAt   time.Time
}

// Archived reports whether the food is archived (kept, but no longer suggested).
func (f Food) Archived() bool { return f.ArchivedAt != nil }

// ErrFoodNameTaken is returned when another active food has the same name.
var ErrFoodNameTaken = errors.New("store: a food with this name already exists")

const foodCols = `id, name, carbohydrate_g::float8, protein_g::float8, fat_g::float8, fibre_g::float8, energy_kcal::float8,
	portion_name, portion_g::float8, liquid, portable, contains_gluten, facts, facts_recorded, source, source_name,
	coalesce(cooked_yield, 0)::float8, archived_at, created_at, updated_at`

func scanFood(row pgx.Row) (Food, error) {
	var f Food
	err := row.Scan(&f.ID, &f.Name, &f.CarbohydrateG, &f.ProteinG, &f.FatG, &f.FibreG, &f.EnergyKcal,
		&f.PortionName, &f.PortionG, &f.Liquid, &f.Portable, &f.ContainsGluten, &f.Facts, &f.FactsRecorded, &f.Source, &f.SourceName, &f.CookedYield, &f.ArchivedAt, &f.CreatedAt, &f.UpdatedAt)
	return f, notFound(err)
}

// ListFoods lists foods by name; archived ones only when asked.
func (s *Store) ListFoods(ctx context.Context, withArchived bool) ([]Food, error) {
	rows, err := s.Pool.Query(ctx, `SELECT `+foodCols+` FROM foods WHERE $1 OR archived_at IS NULL
		ORDER BY archived_at IS NOT NULL, lower(name), id`, withArchived)
	if err != nil {
		return nil, err
	}
	return pgx.CollectRows(rows, func(r pgx.CollectableRow) (Food, error) { return scanFood(r) })
}

// FoodByID loads one food.
func (s *Store) FoodByID(ctx context.Context, id int64) (Food, error) {
	return scanFood(s.Pool.QueryRow(ctx, `SELECT `+foodCols+` FROM foods WHERE id = $1`, id))
}

func foodDetail(f *Food) map[string]any {
	return map[string]any{"name": f.Name, "carbohydrate_g": f.CarbohydrateG, "protein_g": f.ProteinG, "fat_g": f.FatG,
		"fibre_g": f.FibreG, "energy_kcal": f.EnergyKcal, "portion_name": f.PortionName, "portion_g": f.PortionG,
		"liquid": f.Liquid, "portable": f.Portable, "contains_gluten": f.ContainsGluten, "facts": f.Facts, "source": f.Source,
		"source_name": f.SourceName, "cooked_yield": f.CookedYield}
}

func foodErr(err error) error {
	if isUniqueViolation(err) {
		return ErrFoodNameTaken
	}
	return err
}

// AddFood records a food; f.ID is filled in.
func (s *Store) AddFood(ctx context.Context, actor Actor, f *Food) error {
	return foodErr(s.inTx(ctx, func(tx pgx.Tx) error {
		if err := tx.QueryRow(ctx, `INSERT INTO foods (name, carbohydrate_g, protein_g, fat_g, fibre_g, energy_kcal,
			portion_name, portion_g, liquid, portable, source, contains_gluten, facts, facts_recorded, source_name, cooked_yield)
			VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11, $12, $13, $14, $15, $16)
			RETURNING id, created_at, updated_at`,
			f.Name, f.CarbohydrateG, f.ProteinG, f.FatG, f.FibreG, f.EnergyKcal, f.PortionName, f.PortionG,
			f.Liquid, f.Portable, f.Source, f.ContainsGluten, factsOf(f), f.FactsRecorded, f.SourceName, yieldOf(f)).Scan(&f.ID, &f.CreatedAt, &f.UpdatedAt); err != nil {
			return err
		}
		return AuditTx(ctx, tx, actor, "create", "food", f.ID, foodDetail(f))
	}))
}

// UpdateFood saves a changed food.
func (s *Store) UpdateFood(ctx context.Context, actor Actor, f *Food) error {
	return foodErr(s.inTx(ctx, func(tx pgx.Tx) error {
		if err := execOne(ctx, tx, `UPDATE foods SET name = $2, carbohydrate_g = $3, protein_g = $4, fat_g = $5, fibre_g = $6,
			energy_kcal = $7, portion_name = $8, portion_g = $9, liquid = $10, portable = $11, source = $12,
			contains_gluten = $13, facts = $14, facts_recorded = $15, source_name = $16, cooked_yield = $17, updated_at = now()
			WHERE id = $1`,
			f.ID, f.Name, f.CarbohydrateG, f.ProteinG, f.FatG, f.FibreG, f.EnergyKcal, f.PortionName, f.PortionG,
			f.Liquid, f.Portable, f.Source, f.ContainsGluten, factsOf(f), f.FactsRecorded, f.SourceName, yieldOf(f)); err != nil {
			return err
		}
		return AuditTx(ctx, tx, actor, "update", "food", f.ID, foodDetail(f))
	}))
}

// ArchiveFood takes a food off the list of suggestions; it stays readable.
func (s *Store) ArchiveFood(ctx context.Context, actor Actor, id int64) error {
	return s.setFoodArchived(ctx, actor, id, true)
}

// UnarchiveFood brings an archived food back.
func (s *Store) UnarchiveFood(ctx context.Context, actor Actor, id int64) error {
	return s.setFoodArchived(ctx, actor, id, false)
}

func (s *Store) setFoodArchived(ctx context.Context, actor Actor, id int64, archive bool) error {
	return foodErr(s.inTx(ctx, func(tx pgx.Tx) error {
		q := `UPDATE foods SET archived_at = NULL, updated_at = now() WHERE id = $1`
		action := "unarchive"
		if archive {
			q = `UPDATE foods SET archived_at = coalesce(archived_at, now()), updated_at = now() WHERE id = $1`
			action = "archive"
		}
		if err := execOne(ctx, tx, q, id); err != nil {
			return err
		}
		return AuditTx(ctx, tx, actor, action, "food", id, nil)
	}))
}

// factsOf is a food's facts as stored: never NULL, and gluten among them
// when the gluten flag is set.
func factsOf(f *Food) []string {
	out := append([]string{}, f.Facts...)
	if f.ContainsGluten && !slices.Contains(out, "gluten") {
		out = append(out, "gluten")
	}
	return out
}

// yieldOf is a food's cooked yield as stored: NULL when eaten as weighed.
func yieldOf(f *Food) *float64 {
	if f.CookedYield > 0 {
		return &f.CookedYield
	}
	return nil
}

// Menu is the food as the suggester (internal/menu) needs it.
func (f Food) Menu() menu.Food {
	return menu.Food{ID: f.ID, Name: f.Name, SourceName: f.SourceName, CookedYield: f.CookedYield,
		ChoPer100: f.CarbohydrateG, ProtPer100: f.ProteinG, FatPer100: f.FatG, FibrePer100: f.FibreG,
		PortionName: f.PortionName, PortionG: f.PortionG, Liquid: f.Liquid, Portable: f.Portable,
		Practice: f.Source == SourceLabel, ContainsGluten: f.ContainsGluten, Facts: f.Facts, FactsRecorded: f.FactsRecorded}
}

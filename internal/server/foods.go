package server

import (
	"errors"
	"fmt"
	"net/http"
	"net/url"

	"github.com/go-chi/chi/v5"

	"larder/internal/forms"
	"larder/internal/menu"
	"larder/internal/store"
	"larder/web"
)

// mountFoodRoutes adds the Foods pages: every staff member may read the list,
// only admins change it.
func (s *Server) mountFoodRoutes(r chi.Router) {
	r.Get("/foods", s.foodsPage)
	r.Group(func(r chi.Router) {
		r.Use(s.requireAdmin)
		r.Get("/foods/new", s.newFoodPage)
		r.Post("/foods", s.addFood)
		r.Get("/foods/{foodID}/edit", s.editFoodPage)
		r.Post("/foods/{foodID}", s.updateFood)
		r.Post("/foods/{foodID}/archive", s.archiveFood(true))
		r.Post("/foods/{foodID}/unarchive", s.archiveFood(false))
	})
}

// foodForm is the Foods form: per-100 g figures, a household portion and the source.
type foodForm struct {
	Name            string   `form:"name" label:"Name" validate:"required,max=200"`
	CarbohydrateG   *float64 `form:"carbohydrate_g" label:"Carbohydrate" unit:"g per 100 g" validate:"required,gte=0,lte=100"`
	ProteinG        *float64 `form:"protein_g" label:"Protein" unit:"g per 100 g" validate:"required,gte=0,lte=100"`
	FatG            *float64 `form:"fat_g" label:"Fat" unit:"g per 100 g" validate:"required,gte=0,lte=100"`
	FibreG          *float64 `form:"fibre_g" label:"Fibre" unit:"g per 100 g" validate:"required,gte=0,lte=100"`
	EnergyKcal      *float64 `form:"energy_kcal" label:"Energy" unit:"kcal per 100 g" validate:"required,gte=0,lte=900"`
	EnergyConfirmed bool     `form:"energy_confirmed"`
	PortionName     string   `form:"portion_name" label:"Household portion" validate:"required,max=100"`
	PortionG        *float64 `form:"portion_g" label:"Portion weight" unit:"g" validate:"required,gt=0,lte=2000"`
	Liquid          bool     `form:"liquid"`
	Portable        bool     `form:"portable"`
	ContainsGluten  bool     `form:"contains_gluten"`
	Source          string   `form:"source" label:"Source" validate:"required,max=100"`
	SourceName      string   `form:"source_name" label:"Name in the composition table" validate:"max=200"`
	CookedYield     *float64 `form:"cooked_yield" label:"Cooked weight" unit:"g per g as weighed" validate:"omitempty,gte=1,lte=10"`
}

// decodeFood reads and checks the form; the food is ready to save only when
// the returned form has no errors.
func decodeFood(values url.Values) (store.Food, forms.Form) {
	var in foodForm
	f := forms.Decode(values, &in)
	// The checks across fields run whenever the figures they need are good,
	// so that every problem shows at once.
	good := func(name string, v *float64) bool { return v != nil && f.Err(name) == "" }
	if good("carbohydrate_g", in.CarbohydrateG) && good("protein_g", in.ProteinG) && good("fat_g", in.FatG) && good("fibre_g", in.FibreG) {
		if sum := *in.CarbohydrateG + *in.ProteinG + *in.FatG + *in.FibreG; sum > 100 {
			f.Errors.Add("total", fmt.Sprintf("Carbohydrate, protein, fat and fibre add up to %s g, but 100 g of a food cannot hold more than 100 g of them. Check the figures are per 100 g.", web.Num(sum, 1)))
		}
	}
	if good("carbohydrate_g", in.CarbohydrateG) && good("protein_g", in.ProteinG) && good("fat_g", in.FatG) && good("energy_kcal", in.EnergyKcal) {
		if est, far := menu.EnergyFarOff(*in.EnergyKcal, *in.CarbohydrateG, *in.ProteinG, *in.FatG); far && !in.EnergyConfirmed {
			f.Errors.Add("energy_kcal", fmt.Sprintf("Energy of %s kcal is far from the %s kcal that the carbohydrate, protein and fat give (4, 4 and 9 kcal per g). Check it is kcal, not kJ, and per 100 g; if the label really says so, tick the box below.",
				web.Num(*in.EnergyKcal, 0), web.Num(est, 0)))
		}
	}
	// The dietary facts, one box each (gluten has its own box above);
	// a food saved through this form has its facts recorded, none ticked
	// meaning it contains none of them.
	var facts []string
	for _, fact := range menu.Facts {
		if fact.Code == menu.FactGluten {
			continue
		}
		if values.Get(web.FactInput(fact.Code)) == "on" {
			facts = append(facts, fact.Code)
		}
	}
	if f.Has() {
		return store.Food{}, f
	}
	yield := 0.0
	if in.CookedYield != nil {
		yield = *in.CookedYield
	}
	return store.Food{
		Name: in.Name, CarbohydrateG: *in.CarbohydrateG, ProteinG: *in.ProteinG, FatG: *in.FatG, FibreG: *in.FibreG,
		EnergyKcal: *in.EnergyKcal, PortionName: in.PortionName, PortionG: *in.PortionG,
		Liquid: in.Liquid, Portable: in.Portable, ContainsGluten: in.ContainsGluten, Source: in.Source,
		Facts: facts, FactsRecorded: true, SourceName: in.SourceName, CookedYield: yield,
	}, f
}

func foodValues(fd store.Food) url.Values {
	v := url.Values{}
	v.Set("name", fd.Name)
	v.Set("carbohydrate_g", web.Num(fd.CarbohydrateG, 2))
	v.Set("protein_g", web.Num(fd.ProteinG, 2))
	v.Set("fat_g", web.Num(fd.FatG, 2))
	v.Set("fibre_g", web.Num(fd.FibreG, 2))
	v.Set("energy_kcal", web.Num(fd.EnergyKcal, 1))
	v.Set("portion_name", fd.PortionName)
	v.Set("portion_g", web.Num(fd.PortionG, 1))
	v.Set("source", fd.Source)
	v.Set("source_name", fd.SourceName)
	if fd.CookedYield > 0 {
		v.Set("cooked_yield", web.Num(fd.CookedYield, 2))
	}
	if fd.Liquid {
		v.Set("liquid", "on")
	}
	if fd.Portable {
		v.Set("portable", "on")
	}
	if fd.ContainsGluten {
		v.Set("contains_gluten", "on")
	}
	for _, code := range fd.Facts {
		if code != menu.FactGluten {
			v.Set(web.FactInput(code), "on")
		}
	}
	return v
}

// MenuFoods converts the active foods to what internal/menu needs.
func MenuFoods(foods []store.Food) []menu.Food {
	out := make([]menu.Food, 0, len(foods))
	for _, f := range foods {
		if !f.Archived() {
			out = append(out, menuFood(f))
		}
	}
	return out
}

func menuFood(f store.Food) menu.Food { return f.Menu() }

func (s *Server) foodsPage(w http.ResponseWriter, r *http.Request) {
	showAll := r.URL.Query().Get("show") == "all"
	foods, err := s.Store.ListFoods(r.Context(), showAll)
	if err != nil {
		s.ServerError(w, r, err)
		return
	}
	rows := make([]web.FoodRow, len(foods))
	for i, f := range foods {
		rows[i] = web.FoodRow{Food: f, LowFibre: menu.IsLowFibre(menuFood(f))}
	}
	u := CurrentUser(r)
	s.Render(w, r, http.StatusOK, "Foods", "foods", web.FoodsPage(rows, u != nil && u.IsAdmin(), showAll))
}

func (s *Server) newFoodPage(w http.ResponseWriter, r *http.Request) {
	v := url.Values{}
	v.Set("source", store.SourceLabel)
	s.Render(w, r, http.StatusOK, "Add a food", "foods", web.FoodForm(forms.FromValues(v), 0))
}

func (s *Server) addFood(w http.ResponseWriter, r *http.Request) {
	if !s.ParseForm(w, r) {
		return
	}
	fd, f := decodeFood(r.PostForm)
	if f.Has() {
		s.Render(w, r, http.StatusUnprocessableEntity, "Add a food", "foods", web.FoodForm(f, 0))
		return
	}
	if err := s.Store.AddFood(r.Context(), Actor(r), &fd); err != nil {
		if errors.Is(err, store.ErrFoodNameTaken) {
			f.Errors.Add("name", "Another food already has this name. Choose a name that tells them apart.")
			s.Render(w, r, http.StatusUnprocessableEntity, "Add a food", "foods", web.FoodForm(f, 0))
			return
		}
		s.ServerError(w, r, err)
		return
	}
	s.Flash(r, "Food saved: "+fd.Name+".")
	Redirect(w, r, "/foods")
}

func (s *Server) foodFromURL(w http.ResponseWriter, r *http.Request) (store.Food, bool) {
	id, ok := s.ParamID(w, r, "foodID")
	if !ok {
		return store.Food{}, false
	}
	fd, err := s.Store.FoodByID(r.Context(), id)
	if err != nil {
		s.StoreError(w, r, err)
		return store.Food{}, false
	}
	return fd, true
}

func (s *Server) editFoodPage(w http.ResponseWriter, r *http.Request) {
	fd, ok := s.foodFromURL(w, r)
	if !ok {
		return
	}
	f := forms.FromValues(foodValues(fd))
	if err := s.setVersion(r, f, store.VersionFood, fd.ID); err != nil {
		s.ServerError(w, r, err)
		return
	}
	s.Render(w, r, http.StatusOK, "Edit food", "foods", web.FoodForm(f, fd.ID))
}

func (s *Server) updateFood(w http.ResponseWriter, r *http.Request) {
	old, ok := s.foodFromURL(w, r)
	if !ok || !s.ParseForm(w, r) {
		return
	}
	fd, f := decodeFood(r.PostForm)
	if f.Has() {
		s.Render(w, r, http.StatusUnprocessableEntity, "Edit food", "foods", web.FoodForm(f, old.ID))
		return
	}
	fd.ID = old.ID
	if err := s.Store.UpdateFood(guarded(r, store.VersionFood, old.ID), Actor(r), &fd); err != nil {
		if errors.Is(err, store.ErrStale) {
			if err := s.refuseStale(r, f, store.VersionFood, old.ID); err != nil {
				s.ServerError(w, r, err)
				return
			}
			s.Render(w, r, http.StatusConflict, "Edit food", "foods", web.FoodForm(f, old.ID))
			return
		}
		if errors.Is(err, store.ErrFoodNameTaken) {
			f.Errors.Add("name", "Another food already has this name. Choose a name that tells them apart.")
			s.Render(w, r, http.StatusUnprocessableEntity, "Edit food", "foods", web.FoodForm(f, old.ID))
			return
		}
		s.StoreError(w, r, err)
		return
	}
	s.Flash(r, "Food saved: "+fd.Name+".")
	Redirect(w, r, "/foods")
}

func (s *Server) archiveFood(archive bool) http.HandlerFunc {
	return func(w http.ResponseWriter, r *http.Request) {
		fd, ok := s.foodFromURL(w, r)
		if !ok {
			return
		}
		var err error
		if archive {
			err = s.Store.ArchiveFood(r.Context(), Actor(r), fd.ID)
		} else {
			err = s.Store.UnarchiveFood(r.Context(), Actor(r), fd.ID)
		}
		if err != nil {
			if errors.Is(err, store.ErrFoodNameTaken) {
				s.Flash(r, "“"+fd.Name+"” cannot be restored: another food now has that name. Rename one of them first.")
				Redirect(w, r, "/foods?show=all")
				return
			}
			s.StoreError(w, r, err)
			return
		}
		if archive {
			s.Flash(r, "Food archived: "+fd.Name+". It is no longer suggested; plans that used it keep their text.")
		} else {
			s.Flash(r, "Food restored: "+fd.Name+".")
		}
		Redirect(w, r, "/foods")
	}
}

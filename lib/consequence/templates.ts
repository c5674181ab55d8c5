// Starting points for a shelf-life model's temperature dependence, each with its published source. They fill
// the dependence only: the shelf life at the reference temperature is the product's own and must come from the
// food business operator's shelf-life studies. No organism growth parameters ship: enter b and Tmin from the
// original paper for the organism and food in question (with the paper in "source"), or your own data.

export interface DependenceTemplate {
  key: string;
  title: string;
  fields: { dependence: "sqrt"; tmin_C: number } | { dependence: "q10"; q10: number } | { dependence: "arrhenius"; ea_kJ_mol: number };
  source: string;
}

export const DEPENDENCE_TEMPLATES: readonly DependenceTemplate[] = [
  {
    key: "cold-smoked-salmon-exponential",
    title: "Vacuum-packed cold-smoked salmon: ln(RRS) = 0.089·T (as Q10 = e^0.89 = 2.435)",
    // Q10 = RRS(T + 10)/RRS(T) = exp(0.089·10)
    fields: { dependence: "q10", q10: Number(Math.exp(0.89).toFixed(4)) },
    source:
      "Dalgaard, Murillo and Jørgensen (2004), Modelling the effect of temperature on shelf-life and on the interaction between the spoilage microflora and Listeria monocytogenes in cold-smoked salmon, in Shahidi and Simpson (eds), Seafood Quality and Safety, pp. 281–302; valid 0–25 °C for that product. Validate for yours.",
  },
  {
    key: "fresh-seafood-sqrt",
    title: "Fresh seafood from temperate waters: square-root model, Tmin = −10 °C",
    fields: { dependence: "sqrt", tmin_C: -10 },
    source:
      "Relative rate of spoilage of fresh fish, Tmin = −10 °C, as used by Dalgaard (2002), Modelling and predicting the shelf-life of seafood, in Bremner (ed), Safety and Quality Issues in Fish Processing, pp. 191–219 (value recalled from memory: check the source). Validate for your product.",
  },
];

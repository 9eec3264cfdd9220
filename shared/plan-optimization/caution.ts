// The sentence every optimisation result carries, beside the product's usual caution.
export const OPTIMUM_IS_NOT_A_PLAN =
  'This is a mathematical optimum under the stated assumptions, not an operational plan: contraflow needs crossovers at both ends, staff and traffic control, and a licensed engineer’s design; closures, lanes and departure orders need the same review.';

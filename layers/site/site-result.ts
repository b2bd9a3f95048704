/**
 * The output of `simulateSite` (JSON-serialisable; `null` where a value does not exist).
 * Times are years since the start of the run (365-day years, as in surface-forcing.ts).
 */
export interface SiteProbeResult {
  r_m: number;
  z_m: number;
  /** Temperature at each output time, °C (same length as time_yr). */
  T_C: number[];
  /**
   * Time the summer thaw first reaches the probe, yr: when the annual maximum thaw depth at the probe's
   * distance from the axis (read from the liquid fraction of the cells, so a front inside a cell
   * counts) crosses the probe's depth, interpolated between consecutive years' maxima; 0 if the probe
   * is unfrozen at the start; null if the thaw never reaches it within the run.
   */
  thawYear: number | null;
}

export interface SiteEnergyBalance {
  /** Change of stored enthalpy (sensible + latent), J. */
  stored_J: number;
  /** Net heat in through the surface, the bottom and the pile wall, J. */
  boundaries_J: number;
  surface_J: number;
  bottom_J: number;
  pile_J: number;
  /** |stored − boundaries| / Σ|boundary heat flow|·Δt. */
  relativeError: number;
}

export interface SiteCaseResult {
  time_yr: number[];
  /**
   * Thaw depth on the far-field column at each output time, m: the depth down to which the ground has
   * thawed (liquid fraction > 1/2) within the preceding 365 days, continuous from the surface, i.e. the
   * permafrost table; the domain depth when the column holds no permafrost.
   */
  thawDepth_m: number[];
  /**
   * Deepest thaw on the far-field column during each simulated year, m (one per year), with sub-cell
   * resolution (the active-layer thickness, or the talik depth once the ground no longer refreezes).
   */
  annualThawDepth_m: number[];
  probes: SiteProbeResult[];
  energyBalance: SiteEnergyBalance;
  /** Steps accepted with the pile coupling at its sweep limit (0: such steps are halved instead). */
  unconvergedSteps: number;
  /**
   * Work of the linear solver over the run (for benchmarks): passes of forward and back substitution
   * (two right-hand sides in one pass count once), right-hand sides solved, band rows re-factored,
   * passes of the enthalpy Newton iteration, and steps halved because an attempt did not converge.
   */
  solverWork?: {
    substitutions: number;
    rightHandSides: number;
    refactoredRows: number;
    phasePasses: number;
    halvedSteps: number;
  };
}

export interface SiteFluidResult {
  /** Start of each month, yr. */
  month_yr: number[];
  /** Mean inlet and outlet temperatures while the loop runs, °C (null if it never ran that month). */
  inlet_C: (number | null)[];
  outlet_C: (number | null)[];
  /** Heat extracted from the ground that month, kWh (negative = injected). */
  extracted_kWh: number[];
  /** Building heat delivered by the heat pump and the shortfall left to a backup heater, kWh (building mode). */
  delivered_kWh: number[] | null;
  unmet_kWh: number[] | null;
  /** Lowest fluid temperature reached (inlet or outlet), °C, and when, yr. */
  lowest_C: number | null;
  lowestAt_yr: number | null;
  /** Resistances used, m·K/W, and the flow, L/min. */
  Rb_mK_W: number;
  Ra_mK_W: number;
  flow_L_min: number;
}

export interface SiteOverCooling {
  /** Simulated year (1 = first winter). */
  year: number[];
  /** Day of the year taken as the end of winter (surface temperature turns positive). */
  endOfWinterDay: number;
  /**
   * Volume of ground that was unfrozen at the start of each winter (with the pile; the first winter:
   * at t = 0) and is frozen at the end of that winter with the pile while unfrozen at the same time
   * without it, m³ (the ground the pile freezes that nature would have left unfrozen).
   */
  frozenByPile_m3: number[];
}

export interface SiteResult {
  noPile: SiteCaseResult;
  withPile: SiteCaseResult | null;
  /** Per probe: thawYear(with pile) − thawYear(no pile), yr; null where neither case thaws. */
  thawDelay_yr: (number | null)[];
  /** Per probe: true when the pile case did not thaw within the run, so the delay is a lower bound. */
  thawDelayIsLowerBound: boolean[];
  /**
   * Per probe: true when only the pile case thawed within the run (heat injected into the ground), so
   * the delay (negative) is an upper bound: the pile brings the thaw forward by at least its magnitude.
   */
  thawDelayIsUpperBound: boolean[];
  energyBalance: { relativeError: number };
  fluid: SiteFluidResult | null;
  overCooling: SiteOverCooling | null;
  mesh: { nr: number; nz: number; timeSteps: number; radius_m: number; depth_m: number };
  warnings: string[];
  cautions: string[];
}

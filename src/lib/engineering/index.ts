/**
 * The trade's computations: pure TypeScript, no I/O, no Svelte/Kit/DB imports.
 * Runs unchanged in the browser (bench tools) and on the server (spec checks).
 * Plain SI numbers with the unit in every name; RangeError (InputRangeError names the field) for impossible input.
 */
export {
	InputRangeError,
	MARKING_KINDS,
	TOLERANCE_LETTERS,
	cleanNumber,
	parseValue,
	parseQuantity,
	QUANTITY_PREFIX,
	decodeMarking,
	formatValue,
	taperNoteFor,
	type ValueKind,
	type ValueUnit,
	type ValueAs,
	type MarkingAs,
	type ParsedValue,
	type DecodedMarking
} from './values';
export { E_SERIES, isESeriesName, eSeriesMantissas, nearestESeries, type ESeriesName, type ESeriesSnap } from './eseries';
export {
	BAND_COLORS,
	normaliseColor,
	bandsFromValue,
	valueFromBands,
	type BandColor,
	type BandReading
} from './bands';
export { networkValue, seriesValue, parallelValue, type NetworkPart, type NetworkArrangement } from './network';
export {
	amplifierOutput,
	railPerSideV,
	totalSupplyV,
	worstCaseDissipationW,
	nonInvertingGain,
	rcCornerHz,
	cascadeHighPassHz,
	cascadeLowPassHz,
	zobel,
	stageWorstCase,
	designDissipationCurve,
	type DissipationPoint,
	TOPOLOGIES,
	MAINS_HIGH_PCT,
	CLASS_D_EFFICIENCY_PCT,
	type Topology,
	type StageInput,
	type StageWorstCase,
	type SupplyKind,
	type AmplifierInput,
	type AmplifierOutput,
	type ZobelInput
} from './amplifier';
export {
	heatsink,
	junctionTempC,
	deratedPowerW,
	CASE_TO_SINK_KPERW,
	type HeatsinkInput,
	type HeatsinkOutput,
	type JunctionInput,
	type InterfaceKind,
	type CaseToSinkEntry
} from './thermal';
export {
	RECTIFIERS,
	DIODE_DROPS,
	RAIL_COUNT,
	TRANSFORMER_VA_FACTOR,
	rippleHz,
	unloadedRailV,
	supplyRails,
	reservoirForRippleF,
	capMarginRatio,
	transformerVaNeeded,
	bleederTimeS,
	bleederPowerW,
	storedEnergyJ,
	primaryCurrentA,
	primaryFuseRangeA,
	supplyWorstCase,
	REGULATION_ASSUMED_PCT,
	MAINS_TOLERANCE_PCT,
	CAPACITOR_INPUT_FORM_FACTOR,
	rectifierCurrents,
	windingRatingFromVaA,
	railSag,
	type RectifierCurrentsInput,
	type RectifierCurrents,
	type RailSagInput,
	type RailSagPoint,
	type SupplyWorstCaseInput,
	type SupplyWorstCaseOutput,
	type RectifierKind,
	type SupplyRailsInput,
	type SupplyRailsOutput,
	type ReservoirInput,
	type BleederInput
} from './supply';
export {
	COPPER_RESISTIVITY_OHM_M,
	parallelLoadOhm,
	seriesLoadOhm,
	minimumImpedanceOhm,
	cableResistanceOhm,
	dampingFactor,
	type DampingInput
} from './speaker';
export {
	DBU_REF_V,
	voltageRatioDb,
	powerRatioDb,
	dbV,
	dbu,
	dbW,
	dbm,
	vFromDbV,
	vFromDbu,
	wFromDbW,
	wFromDbm,
	sinePowerW,
	vrmsForPowerW,
	thdPct,
	pctToDb,
	snrDb,
	idleCurrentA,
	responseCornersHz,
	type ResponsePoint
} from './measure';

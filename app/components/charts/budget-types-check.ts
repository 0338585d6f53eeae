/**
 * Compile-time only: the engine's budget must fit the chart's prop type and the other way round,
 * so a field added to or renamed in the engine shows up here at `tsc`. Types only — no runtime
 * code from models/ reaches the client bundle.
 */
import type { NitrogenBudget, Stocks } from "../../../models";
import type { ChartBudget, ChartStocks } from "./types";

type Same<A, B> = [A] extends [B] ? ([B] extends [A] ? true : false) : false;
type Assert<T extends true> = T;

export type _BudgetMatchesEngine = Assert<Same<ChartBudget, NitrogenBudget>>;
export type _StocksMatchEngine = Assert<Same<ChartStocks, Stocks>>;

// The trade-off panel.
export { mountTradeoff, type TradeoffOptions } from './tradeoff-panel';

// The shipment tables' row hashes live with the other content hashes (lib/review/content.ts), where verify reads them.
export { shipmentRowContentHash, SHIPMENT_TABLES, type ShipmentTable } from "../review/content";

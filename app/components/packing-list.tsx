import { SimpleTable } from "~/components/ui";
import { formatQuantity, type PackingItem } from "~/lib/packing-list";

/** A shipment's items as a table: on the shipments page, the printed packing list and the lab's receipt page. */
export function PackingItemsTable({ caption, items, note }: { caption: string; items: PackingItem[]; note: string }) {
  return (
    <>
      {items.length > 0 ? (
        <SimpleTable
          caption={caption}
          headers={["Material or constituent", "Quantity", "Lot", "Containers"]}
          // Quantities and lot numbers stay on one line; the description wraps.
          rows={items.map((item) => [
            item.description,
            <span key="quantity" className="whitespace-nowrap">{formatQuantity(item.quantity, item.unit)}</span>,
            <span key="lot" className="whitespace-nowrap">{item.lot || "—"}</span>,
            item.containerCount,
          ])}
        />
      ) : (
        <p>No items listed.</p>
      )}
      {note && <p className="mt-2 whitespace-pre-line">Note: {note}</p>}
    </>
  );
}

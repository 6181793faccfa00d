-- Shipments from before the itemised packing list keep their free-text contents, readable, as the shipment's note.
UPDATE `shipments` SET `note` = `contents` WHERE `contents` <> '';
